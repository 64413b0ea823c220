package org.wavewarden.review;

import java.time.Instant;
import java.util.List;

/**
 * A record that a named person released a wave, with what the release rested on.
 *
 * @param release           the release (revision) signed, '' for a dataset without releases
 * @param runId             the run whose findings the release was signed on
 * @param configFingerprint the configuration the run was judged under
 * @param toolVersion       the tool version that judged it
 * @param forced            signed although a MATERIAL alert of the wave was open
 * @param forceReason       the reason given for forcing; null unless forced
 * @param alertsAtSignOff   the wave's alerts at that moment with their states
 */
public record SignOff(long signOffId, String dataset, String wave, String release, String actor, Instant signedAt,
                      long runId, String configFingerprint, String toolVersion, boolean forced, String forceReason,
                      List<AlertView> alertsAtSignOff) {

    public SignOff {
        alertsAtSignOff = alertsAtSignOff == null ? List.of() : List.copyOf(alertsAtSignOff);
    }
}
