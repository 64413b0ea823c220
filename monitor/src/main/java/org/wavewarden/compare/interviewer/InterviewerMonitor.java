package org.wavewarden.compare.interviewer;

import org.wavewarden.config.Breakdowns;
import org.wavewarden.judge.Finding;
import org.wavewarden.missing.ScreenedWave;
import org.wavewarden.profile.WaveProfile;

import java.util.List;

/** Judges the interviewers of one wave from its summary's interviewer-column domain tallies. */
public final class InterviewerMonitor {

    private InterviewerMonitor() {
    }

    /**
     * What interviewer monitoring found in one wave.
     *
     * @param findings INTERVIEWER_OUTLIER findings (one per flag, detail the {@link InterviewerFlag}) and
     *                 INTERVIEWER_EFFECT findings (one per measure whose correlation's interval lies above the
     *                 threshold, detail the {@link InterviewerEffect})
     * @param flags    every flagged interviewer and variable
     * @param effects  every measure's interviewer effect, reported or not
     * @param notes    what was not judged and why (interviewers under the minimum workload, overflow)
     */
    public record Result(List<Finding> findings, List<InterviewerFlag> flags, List<InterviewerEffect> effects,
                         List<String> notes) {
    }

    /**
     * Monitors the interviewers of {@code current}: the column {@code config.interviewer()} must be among the
     * summary's domain tallies; empty result otherwise.
     *
     * @param screened the wave as screened (its missing codes and disguised missing values per variable)
     */
    public static Result judge(WaveProfile current, ScreenedWave screened, Breakdowns config, double alpha) {
        throw new UnsupportedOperationException("skeleton: interviewer owner implements");
    }
}
