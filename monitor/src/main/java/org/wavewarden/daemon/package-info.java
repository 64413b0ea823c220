/**
 * The long-running daemon around the pipeline: Quartz scheduling on the clustered job store, one firing per dataset
 * ({@code DatasetFiring}), readiness, carrying out the outbox ({@code Deliveries}), the status endpoint
 * ({@code StatusServer}, paths in {@code Router}) and its metrics ({@code DaemonMetrics}).
 */
package org.wavewarden.daemon;
