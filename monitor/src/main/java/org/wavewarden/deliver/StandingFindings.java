package org.wavewarden.deliver;

import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;

/**
 * The findings the digests list apart from the alerts, because repeating them as alerts would say nothing new: the
 * variables the samples cannot judge (listed once per dataset, not per wave), data-quality findings still present
 * since an earlier wave, and problems that cleared.
 */
public final class StandingFindings {

    private StandingFindings() {
    }

    /**
     * A variable whose latest finding is UNCERTAIN on samples that cannot resolve its threshold: its interval's
     * half-width (the smallest change the two waves could show) is at least the threshold, so no estimate could
     * be shown STABLE and the verdict says only that there are too few answers.
     *
     * @param effect     the latest finding's effect, in whose units the minimum detectable effect is given
     * @param nCurrent   the latest wave's answers, or null when not known
     * @param sinceWave  the first wave of the unbroken run of such verdicts (the wave that alerted)
     * @param latestWave the wave of the latest finding
     */
    public record TooFewAnswers(String dataset, String variable, String label, FindingKind kind,
                                Finding.Effect effect, Long nCurrent, String sinceWave, String latestWave) {

        public TooFewAnswers {
            Objects.requireNonNull(effect, "effect");
        }

        public double minimumDetectable() {
            return effect.minimumDetectable();
        }

        public double threshold() {
            return effect.threshold();
        }
    }

    /**
     * Each dataset's variables too few answers can judge, judged by the latest finding of each variable and kind
     * across the reports (given in wave order), in the order the variables first appear. A verdict that is not
     * unresolvable in between breaks the run: the variable is listed again from the wave it returned.
     */
    public static List<TooFewAnswers> tooFewAnswers(List<FindingsReport> reports) {
        Map<List<Object>, TooFewAnswers> latest = new LinkedHashMap<>();
        for (FindingsReport r : reports) {
            for (Finding f : r.findings()) {
                if (f.verdict() == null) {
                    continue;
                }
                List<Object> key = List.of(r.dataset(), f.variable(), f.kind());
                // A later verdict of the same variable and kind replaces the earlier one, whatever it says.
                TooFewAnswers before = latest.remove(key);
                if (unresolvable(f)) {
                    // The repeat mark names the wave that alerted; without one, an unbroken run within these
                    // reports still starts where the earlier entry started.
                    String since = f.repeat() != null && f.repeat().firstWave() != null ? f.repeat().firstWave()
                            : before != null ? before.sinceWave() : r.wave();
                    latest.put(key, new TooFewAnswers(r.dataset(), f.variable(), f.label(), f.kind(), f.effect(),
                            f.nCurrent(), since, r.wave()));
                }
            }
        }
        return new ArrayList<>(latest.values());
    }

    /**
     * An UNCERTAIN verdict whose effect cannot resolve its threshold. An interval that could not be computed
     * (NaN) says nothing about the sample size, so it is not listed.
     */
    static boolean unresolvable(Finding f) {
        Finding.Effect e = f.effect();
        return f.verdict() == Verdict.UNCERTAIN && e != null && !Double.isNaN(e.minimumDetectable())
                && !Double.isNaN(e.threshold()) && !e.resolvable();
    }

    /** The report's data-quality findings unchanged since an earlier wave: carried, not alerted again. */
    public static List<Finding> stillPresent(FindingsReport r) {
        return r.findings().stream().filter(f -> f.repeat() != null
                && f.repeat().kind() == Finding.Repeat.Kind.STILL_PRESENT).toList();
    }

    /** The report's findings whose problem cleared (a missing rate or sentinel share fell to zero): good news. */
    public static List<Finding> cleared(FindingsReport r) {
        return r.findings().stream().filter(f -> f.verdict() == Verdict.CLEARED).toList();
    }

    /** The report's findings that say a signed-off wave's numbers changed. */
    public static List<Finding> signedWaveChanged(FindingsReport r) {
        return r.findings().stream().filter(f -> f.kind() == FindingKind.SIGNED_WAVE_CHANGED).toList();
    }
}
