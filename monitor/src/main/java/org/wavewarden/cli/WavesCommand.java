package org.wavewarden.cli;

import org.wavewarden.config.DatasetConfig;
import org.wavewarden.deliver.DataText;
import org.wavewarden.pipeline.Session;
import org.wavewarden.pipeline.WaveJudge;
import org.wavewarden.read.WaveInfo;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;

import java.time.Clock;
import java.util.Locale;
import java.util.concurrent.Callable;

@Command(name = "waves", mixinStandardHelpOptions = true,
        description = "List the dataset's waves in order, with row counts and whether each has been judged.")
final class WavesCommand implements Callable<Integer> {

    @Mixin
    ConfigOption config;
    @Mixin
    DatasetOption dataset;

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() {
        try (Session s = config.open()) {
            s.migrate();
            DatasetConfig d = dataset.pick(s.config());
            var out = spec.commandLine().getOut();
            out.println(String.format(Locale.ROOT, "%-16s %10s  %-9s %-16s %s", "wave", "rows", "judged", "against",
                    "alerts"));
            for (WaveInfo w : new WaveJudge(s, Clock.systemUTC()).waves(d)) {
                var run = s.store().currentRun(d.name(), w.wave());
                out.println(String.format(Locale.ROOT, "%-16s %,10d  %-9s %-16s %s", DataText.visible(w.wave()),
                        w.rows(), run.isPresent() ? "yes" : "no",
                        run.map(r -> r.againstWave().isEmpty() ? "-" : DataText.visible(r.againstWave())).orElse(""),
                        run.map(r -> String.valueOf(r.alertsCount())).orElse("")));
            }
        }
        return Main.OK;
    }
}
