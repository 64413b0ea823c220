package org.wavewarden.config;

/**
 * Settings of the long-running daemon.
 *
 * @param httpBind   address of the health, metrics and digest endpoint (127.0.0.1 unless configured)
 * @param httpPort   its port; 0 picks a free one, -1 turns the endpoint off
 * @param outputDir  where each firing's digests are written
 * @param clusterCheckinMillis how often an instance tells the cluster it is alive; a silent instance's firings
 *                   are recovered by another after about this long plus 7.5 s (Quartz's margin)
 * @param redeliverSeconds how often what committed runs still owe (outputs pending after a failure, dead letters
 *                   whose backoff has passed) is carried out between a dataset's scheduled firings; 0 for never
 */
public record DaemonConfig(String httpBind, int httpPort, String outputDir, int clusterCheckinMillis,
                           int redeliverSeconds) {

    public static final DaemonConfig DEFAULTS = new DaemonConfig("127.0.0.1", 8089, "wavewarden-digests", 10_000, 60);
}
