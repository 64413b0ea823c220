package org.wavewarden.cli;

import org.wavewarden.demo.DemoRun;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

import java.nio.file.Path;
import java.util.concurrent.Callable;

@Command(name = "demo", mixinStandardHelpOptions = true,
        description = "Run the demo scenario end to end on an embedded PostgreSQL server: load the demo waves,"
                + " judge each against the previous one, compare the two releases of the panel's revised wave, and"
                + " write findings, digests and the release report.")
final class DemoCommand implements Callable<Integer> {

    @Option(names = "--out", paramLabel = "DIR", defaultValue = "demo-output",
            description = "folder for the outputs (default: ${DEFAULT-VALUE})")
    Path out;

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() {
        var o = spec.commandLine().getOut();
        DemoRun.Outcome r = DemoRun.run(out, o);
        o.println();
        o.println("outputs: " + out.toAbsolutePath().normalize() + " (" + r.outputs().size() + " files, listed above:"
                + " per dataset digest.html and digest.md for all waves and findings.json + digest.md per wave; the"
                + " panel's under " + DemoRun.PANEL_FOLDER + "/, with releases.json + releases.md for its revised"
                + " wave)");
        o.println("These flags are screening aids, not findings; publication decisions rest with the survey's own"
                + " methodologists.");
        return Main.OK;
    }
}
