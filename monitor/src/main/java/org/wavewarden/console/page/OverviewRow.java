package org.wavewarden.console.page;

import org.wavewarden.store.ConsoleReads;

/**
 * A dataset on the overview: what the results schema says, with its schedule and health from the configuration and
 * the daemon.
 *
 * @param schedule the dataset's schedule as configured (e.g. a cron expression), or null for none
 * @param health   a short line on the dataset's last firing ("last firing succeeded 09:12 UTC"), or a statement
 *                 that no daemon runs it here (the standalone console)
 */
public record OverviewRow(ConsoleReads.DatasetSummary summary, String schedule, String health) {
}
