package org.wavewarden.review;

import org.wavewarden.judge.Finding;

import java.util.List;
import java.util.Optional;

/**
 * A rerun of a signed-off wave that changes its findings: the release was signed on other numbers, which the new
 * run says loudly with a SIGNED_WAVE_CHANGED finding.
 */
public final class SignOffDrift {

    private SignOffDrift() {
    }

    /**
     * @param signed         the wave's latest sign-off
     * @param signedFindings the findings of the run it was signed on
     * @param newFindings    the findings of the run being written
     * @return the finding to add when they differ
     */
    public static Optional<Finding> check(SignOff signed, List<Finding> signedFindings, List<Finding> newFindings) {
        return Optional.empty();
    }
}
