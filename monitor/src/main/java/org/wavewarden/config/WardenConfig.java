package org.wavewarden.config;

import java.util.List;

/**
 * The whole configuration of one monitor.
 *
 * @param source   the survey database, opened read-only
 * @param results  where runs, summaries, findings and alerts are written
 * @param alpha    false discovery rate the verdicts are held to
 * @param fdr      multiplicity procedure across every test of a run
 * @param datasets the monitored datasets
 * @param daemon   settings of the daemon
 */
public record WardenConfig(ConnectionConfig source, ResultsConfig results, double alpha, FdrMethod fdr,
                           List<DatasetConfig> datasets, DaemonConfig daemon, ConsoleConfig console) {

    public WardenConfig {
        datasets = List.copyOf(datasets);
        daemon = daemon == null ? DaemonConfig.DEFAULTS : daemon;
        console = console == null ? ConsoleConfig.DISABLED : console;
    }

    /** A configuration without the web console. */
    public WardenConfig(ConnectionConfig source, ResultsConfig results, double alpha, FdrMethod fdr,
                        List<DatasetConfig> datasets, DaemonConfig daemon) {
        this(source, results, alpha, fdr, datasets, daemon, ConsoleConfig.DISABLED);
    }

    public DatasetConfig dataset(String name) {
        return datasets.stream().filter(d -> d.name().equals(name)).findFirst()
                .orElseThrow(() -> new ConfigException("datasets", "no dataset named '" + name + "'; known: "
                        + datasets.stream().map(DatasetConfig::name).toList()));
    }

    /** Results database and schema. Without a connection of its own, results go to the source server. */
    public record ResultsConfig(ConnectionConfig connection, String schema) {
    }

    public enum FdrMethod {
        BENJAMINI_HOCHBERG, BENJAMINI_YEKUTIELI
    }
}
