package org.wavewarden.cli;

import org.wavewarden.bench.ConsoleBench;
import org.wavewarden.bench.ConsoleHistory;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

import java.nio.file.Path;
import java.util.concurrent.Callable;

@Command(name = "console-bench", mixinStandardHelpOptions = true,
        description = {"Measure the web console's pages on a long invented history: writes datasets x waves x"
                + " variables of findings (with alerts, their histories and sign-offs) into a fresh results schema on an"
                + " embedded server, then asks for each page kind many times and prints, per kind, the median, 95th"
                + " percentile and maximum in ms, the statements each page sent, and the median's ratio to a floor"
                + " measured in the same run.",
                "Both the reads behind the pages and the pages over HTTP (the real console on a loopback port,"
                        + " logged in) are measured. The bench logs in as a viewer of its own with a random password;"
                        + " with --config it uses that configuration's console and --user instead (the password from"
                        + " the environment variable --password-env), and writes the history into that configuration's"
                        + " results schema name on the embedded server."})
final class ConsoleBenchCommand implements Callable<Integer> {

    @Option(names = "--datasets", paramLabel = "N", defaultValue = "50",
            description = "datasets (default: ${DEFAULT-VALUE})")
    int datasets;
    @Option(names = "--waves", paramLabel = "N", defaultValue = "40",
            description = "waves of each dataset (default: ${DEFAULT-VALUE})")
    int waves;
    @Option(names = "--variables", paramLabel = "N", defaultValue = "300",
            description = "variables of each wave (default: ${DEFAULT-VALUE})")
    int variables;
    @Option(names = "--requests", paramLabel = "N", defaultValue = "200",
            description = "requests of each page kind (default: ${DEFAULT-VALUE})")
    int requests;
    @Option(names = {"-c", "--config"}, paramLabel = "FILE",
            description = "a configuration whose console login the bench uses over HTTP (default: a login of its own)")
    Path config;
    @Option(names = "--user", paramLabel = "NAME", description = "the console login the bench uses over HTTP")
    String user;
    @Option(names = "--password-env", paramLabel = "VAR", defaultValue = "WAVEWARDEN_CONSOLE_PASSWORD",
            description = "environment variable holding that login's password (default: ${DEFAULT-VALUE})")
    String passwordEnv;

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() {
        ConsoleBench.Options o;
        try {
            WardenConfig c = config == null ? null : ConfigLoader.load(config);
            if (c != null && (user == null || user.isBlank() || System.getenv(passwordEnv) == null)) {
                throw new IllegalArgumentException("measuring the pages over HTTP needs --user and the password in"
                        + " the environment variable " + passwordEnv);
            }
            o = new ConsoleBench.Options(new ConsoleHistory.Size(datasets, waves, variables), requests, c, user,
                    c == null ? null : System.getenv(passwordEnv));
        } catch (IllegalArgumentException e) {
            throw new ConfigException("console-bench", e.getMessage());
        }
        ConsoleBench.run(o, spec.commandLine().getOut());
        return Main.OK;
    }
}
