package org.wavewarden.cli;

import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.WardenConfig;
import picocli.CommandLine.Option;

/** {@code --dataset}, optional when the config has a single dataset. */
final class DatasetOption {

    @Option(names = {"-d", "--dataset"}, paramLabel = "NAME", description = "dataset name from the config (default: the only one)")
    String name;

    DatasetConfig pick(WardenConfig c) {
        if (name == null) {
            if (c.datasets().size() != 1) {
                throw new org.wavewarden.config.ConfigException("--dataset", "the config has " + c.datasets().size()
                        + " datasets; name one of " + c.datasets().stream().map(DatasetConfig::name).toList());
            }
            return c.datasets().get(0);
        }
        return c.dataset(name);
    }
}
