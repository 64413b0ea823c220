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
 * @param source            where it came from: {@code command} or {@code console}
 */
public record SignOff(long signOffId, String dataset, String wave, String release, String actor, Instant signedAt,
                      long runId, String configFingerprint, String toolVersion, boolean forced, String forceReason,
                      List<AlertView> alertsAtSignOff, String source) {

    public SignOff {
        alertsAtSignOff = alertsAtSignOff == null ? List.of() : List.copyOf(alertsAtSignOff);
        source = source == null ? "command" : source;
    }

    /** A sign-off from the command line. */
    public SignOff(long signOffId, String dataset, String wave, String release, String actor, Instant signedAt,
                   long runId, String configFingerprint, String toolVersion, boolean forced, String forceReason,
                   List<AlertView> alertsAtSignOff) {
        this(signOffId, dataset, wave, release, actor, signedAt, runId, configFingerprint, toolVersion, forced,
                forceReason, alertsAtSignOff, "command");
    }
}
