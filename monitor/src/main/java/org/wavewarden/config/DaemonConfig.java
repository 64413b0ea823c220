package org.wavewarden.config;

/**
 * Settings of the long-running daemon.
 *
 * @param httpBind   address of the health, metrics and digest endpoint (127.0.0.1 unless configured)
 * @param httpPort   its port; 0 picks a free one, -1 turns the endpoint off
 * @param outputDir  where each firing's digests are written
 * @param clusterCheckinMillis how often an instance tells the cluster it is alive; a silent instance's firings
 *                   are recovered by another after about this long plus 7.5 s (Quartz's margin)
 */
public record DaemonConfig(String httpBind, int httpPort, String outputDir, int clusterCheckinMillis) {

    public static final DaemonConfig DEFAULTS = new DaemonConfig("127.0.0.1", 8089, "wavewarden-digests", 10_000);
}
