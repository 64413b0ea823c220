package org.wavewarden.cli;

import org.wavewarden.pipeline.Session;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;

import java.util.concurrent.Callable;

@Command(name = "init-db", mixinStandardHelpOptions = true,
        description = "Create or upgrade the results schema (idempotent).")
final class InitDbCommand implements Callable<Integer> {

    @Mixin
    ConfigOption config;

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() {
        try (Session s = config.open()) {
            var r = s.migrate();
            spec.commandLine().getOut().println("results schema " + s.config().results().schema() + " is at version "
                    + (r.targetSchemaVersion == null ? r.initialSchemaVersion : r.targetSchemaVersion)
                    + " (" + r.migrationsExecuted + " migration(s) applied now)");
        }
        return Main.OK;
    }
}
