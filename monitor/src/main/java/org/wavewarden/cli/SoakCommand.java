package org.wavewarden.cli;

import org.wavewarden.soak.Soak;
import org.wavewarden.soak.SoakReport;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

import java.nio.file.Path;
import java.util.concurrent.Callable;

@Command(name = "soak", mixinStandardHelpOptions = true,
        description = {"Run the daemon for a while under injected faults, then audit it: every wave judged exactly once,"
                + " every alert delivered exactly once to the JSON Lines file and to the webhook, nothing lost.",
                "The daemon runs as 'wavewarden run' in a child JVM. A producer adds a survey wave every few seconds;"
                        + " one at a time, at seeded random moments, the database is cut (at random, right after a"
                        + " wave was added, or inside the daemon's results transaction), the webhook receiver goes"
                        + " down, answers 500 or answers slowly, and the daemon is killed with SIGKILL (at random, or"
                        + " during a webhook request) and started again.",
                "Without --jdbc-url an embedded server is started. With one, the soak creates --source-schema and"
                        + " --results-schema there (refusing when they exist, unless --replace) and leaves them for"
                        + " inspection.",
                "Exit code 0 when the audit is clean, 1 when it found a wave not judged exactly once, or an alert lost,"
                        + " duplicated or unexpected."})
final class SoakCommand implements Callable<Integer> {

    @Option(names = "--minutes", paramLabel = "N", required = true,
            description = "how long faults are injected (the catch-up and the audit come after)")
    double minutes;
    @Option(names = "--seed", paramLabel = "S", defaultValue = "1",
            description = "seeds the waves and the fault schedule (default: ${DEFAULT-VALUE})")
    long seed;
    @Option(names = "--out", paramLabel = "DIR", defaultValue = "soak-output",
            description = "folder for the config, logs, alerts, faults and summary (default: ${DEFAULT-VALUE})")
    Path out;
    @picocli.CommandLine.Mixin
    ServerOptions server;
    @Option(names = "--source-schema", paramLabel = "S", defaultValue = "wavewarden_soak_source",
            description = "schema of the source table the soak creates (default: ${DEFAULT-VALUE})")
    String sourceSchema;
    @Option(names = "--results-schema", paramLabel = "S", defaultValue = "wavewarden_soak",
            description = "the daemon's results schema (default: ${DEFAULT-VALUE})")
    String resultsSchema;
    @Option(names = "--replace", description = "drop the two schemas when they exist, instead of refusing to start")
    boolean replace;

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() throws Exception {
        SoakReport r = Soak.run(new Soak.Options(minutes, seed, out, server.jdbcUrl, server.user, server.passwordEnv, sourceSchema,
                resultsSchema, replace), spec.commandLine().getOut());
        return r.clean() ? Main.OK : Main.FINDINGS;
    }
}
