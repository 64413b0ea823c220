package org.wavewarden.cli;

import org.wavewarden.config.DatasetConfig;
import org.wavewarden.deliver.DataText;
import org.wavewarden.deliver.ReleaseDigest;
import org.wavewarden.deliver.ReleaseReport;
import org.wavewarden.pipeline.ReleaseJudge;
import org.wavewarden.pipeline.Session;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

import java.nio.file.Path;
import java.time.Clock;
import java.util.concurrent.Callable;

@Command(name = "releases", mixinStandardHelpOptions = true,
        description = "Compare two publications of one wave, respondent by respondent: rows added and removed,"
                + " changed cells per variable, and the two releases' distributions; writes releases.json and"
                + " releases.md, and keeps the comparison in the results schema for the console's wave page.")
final class ReleasesCommand implements Callable<Integer> {

    @Mixin
    ConfigOption config;
    @Mixin
    DatasetOption dataset;
    @Option(names = "--wave", required = true, paramLabel = "WAVE", description = "the wave whose releases to compare")
    String wave;
    @Option(names = "--release", paramLabel = "RELEASE", description = "with a release column: the later release"
            + " (default: the latest)")
    String release;
    @Option(names = "--against", paramLabel = "RELEASE", description = "with a release column: the earlier release"
            + " (default: the one before --release)")
    String against;
    @Option(names = "--out", paramLabel = "DIR", defaultValue = "wavewarden-out",
            description = "folder for releases.json and releases.md (default: ${DEFAULT-VALUE})")
    Path out;
    @Option(names = "--all", description = "list every distribution finding on the console, not only those worth"
            + " attention")
    boolean all;

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() {
        try (Session s = config.open()) {
            DatasetConfig d = dataset.pick(s.config());
            var err = spec.commandLine().getErr();
            ReleaseReport r = new ReleaseJudge(s, Clock.systemUTC()).compare(d, wave, release, against, out,
                    Progress.rows("reading wave " + wave, err));
            Progress.done(err);
            var o = spec.commandLine().getOut();
            r.revision().inference().forEach(i -> o.println("inferred " + DataText.visible(i)));
            o.print(ReleaseDigest.summary(r, all));
            o.println("wrote " + out.resolve("releases.json") + " and releases.md");
        }
        return Main.OK;
    }
}
