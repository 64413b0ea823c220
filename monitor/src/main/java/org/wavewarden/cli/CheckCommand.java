package org.wavewarden.cli;

import org.wavewarden.config.DatasetConfig;
import org.wavewarden.deliver.ConsoleTable;
import org.wavewarden.deliver.DataText;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.Verdict;
import org.wavewarden.pipeline.JudgedWave;
import org.wavewarden.pipeline.Session;
import org.wavewarden.pipeline.WaveJudge;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

import java.nio.file.Path;
import java.time.Clock;
import java.util.concurrent.Callable;

@Command(name = "check", mixinStandardHelpOptions = true,
        description = "Judge one wave now and write findings.json, digest.md and digest.html.")
final class CheckCommand implements Callable<Integer> {

    @Mixin
    ConfigOption config;
    @Mixin
    DatasetOption dataset;
    @Option(names = "--wave", required = true, paramLabel = "WAVE", description = "the wave to judge")
    String wave;
    @Option(names = "--against", paramLabel = "WAVE", description = "compare with this wave instead of the configured rule"
            + " (default: the previous wave)")
    String against;
    @Option(names = "--out", paramLabel = "DIR", defaultValue = "wavewarden-out",
            description = "folder for findings.json and digest.md (default: ${DEFAULT-VALUE})")
    Path out;
    @Option(names = "--fail-on", paramLabel = "VERDICT", description = "exit 1 when a shift is judged at least this"
            + " urgent: MATERIAL, MINOR or UNCERTAIN")
    Verdict failOn;
    @Option(names = "--all", description = "list every finding on the console, not only those worth attention")
    boolean all;

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() throws java.io.IOException {
        try (Session s = config.open()) {
            s.migrate();
            DatasetConfig d = dataset.pick(s.config());
            var err = spec.commandLine().getErr();
            JudgedWave j = new WaveJudge(s, Clock.systemUTC()).judge(d, wave, against, out,
                    Progress.rows("reading wave " + wave, err));
            Progress.done(err);
            java.nio.file.Files.writeString(out.resolve("digest.html"), new org.wavewarden.pipeline.DigestAssembler(s)
                    .html(d, java.util.List.of(j.report()), java.time.Instant.now()));
            var o = spec.commandLine().getOut();
            j.report().inference().forEach(i -> o.println("inferred " + DataText.visible(i)));
            o.print(ConsoleTable.render(j.report(), all));
            o.println("wrote " + out.resolve("findings.json") + ", digest.md and digest.html; run "
                    + j.runId() + ", " + j.alerts().size() + " alert(s)");
            if (failOn != null && j.report().findings().stream().map(Finding::verdict)
                    .anyMatch(v -> v != null && v.atLeast(failOn))) {
                return Main.FINDINGS;
            }
        }
        return Main.OK;
    }
}
