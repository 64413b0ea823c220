package org.wavewarden.cli;

import org.jdbi.v3.core.Handle;
import org.wavewarden.codebook.Codebooks;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.pipeline.CatalogCheck;
import org.wavewarden.pipeline.Session;
import picocli.CommandLine.Option;

import java.nio.file.Path;

/** The {@code --config} option shared by the commands that talk to a server. */
final class ConfigOption {

    @Option(names = {"-c", "--config"}, required = true, paramLabel = "FILE",
            description = "YAML configuration (see config/example-external.yaml)")
    Path file;

    /**
     * The config with each dataset's codebook merged into its variables; the merge report goes to standard error
     * once, on the first load.
     */
    WardenConfig load() {
        if (loaded == null || !file.equals(loadedFrom)) {
            Codebooks.Resolved r = Codebooks.resolve(ConfigLoader.load(file), file.toAbsolutePath().getParent());
            java.io.PrintWriter err = mixee == null ? new java.io.PrintWriter(System.err, true)
                    : mixee.commandLine().getErr();
            r.report().forEach(err::println);
            err.flush();
            loaded = r.config();
            loadedFrom = file;
        }
        return loaded;
    }

    @picocli.CommandLine.Spec(picocli.CommandLine.Spec.Target.MIXEE)
    picocli.CommandLine.Model.CommandSpec mixee;

    private WardenConfig loaded;
    private Path loadedFrom;

    /** Loads the config, connects, and checks every configured table and column against the catalog. */
    Session open() {
        return open(c -> {
        });
    }

    /** As {@link #open()}, with checks of the loaded config that run before anything connects. */
    Session open(java.util.function.Consumer<WardenConfig> preflight) {
        WardenConfig config = load();
        preflight.accept(config);
        Session s = Session.open(config, null, System.getenv());
        try (Handle h = s.source().open()) {
            CatalogCheck.verify(h, config);
        } catch (RuntimeException e) {
            s.close();
            throw e;
        }
        return s;
    }
}
