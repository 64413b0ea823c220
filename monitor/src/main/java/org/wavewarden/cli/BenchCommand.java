package org.wavewarden.cli;

import org.wavewarden.bench.Bench;
import org.wavewarden.bench.BenchReport;
import org.wavewarden.deliver.Json;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.Callable;

@Command(name = "bench", mixinStandardHelpOptions = true,
        description = {"Measure a check against the floor the database sets: generate a survey, then time, alternating"
                + " in each repetition, a counting scan, a binary COPY of the judged wave, and full checks with 2 and"
                + " with many earlier waves. Writes the figures as JSON.",
                "Without --jdbc-url an embedded server is started. With one, the bench replaces the tables survey and"
                        + " survey_history in schema wavewarden_bench and the schema wavewarden_bench_results there,"
                        + " and leaves them for inspection.",
                "Larger runs: --rows 1000000, --rows 3000000; generating the table takes most of the time (about a"
                        + " minute per million rows and wave), the measurements a few seconds each per million rows."})
final class BenchCommand implements Callable<Integer> {

    @picocli.CommandLine.Mixin
    ServerOptions server;
    @Option(names = "--rows", paramLabel = "R", defaultValue = "100000",
            description = "rows in each of the two judged waves (default: ${DEFAULT-VALUE})")
    long rows;
    @Option(names = "--vars", paramLabel = "V", defaultValue = "40",
            description = "variables of mixed kinds (default: ${DEFAULT-VALUE})")
    int vars;
    @Option(names = "--repeat", paramLabel = "N", defaultValue = "5",
            description = "repetitions of every measurement (default: ${DEFAULT-VALUE})")
    int repeat;
    @Option(names = "--history-waves", paramLabel = "W", defaultValue = "30",
            description = "earlier waves stored before the two judged ones in the history table (default: ${DEFAULT-VALUE})")
    int historyWaves;
    @Option(names = "--history-rows", paramLabel = "R", defaultValue = "10000",
            description = "rows in each earlier wave of the history table (default: ${DEFAULT-VALUE})")
    long historyRows;
    @Option(names = "--breakdowns", paramLabel = "B", defaultValue = "0",
            description = "also scan the judged wave with B generated breakdown columns (district, interview mode,"
                    + " interviewer; 0 to 3) tallied by domain in the same pass (default: ${DEFAULT-VALUE})")
    int breakdowns;
    @Option(names = "--out", paramLabel = "FILE", defaultValue = "bench.json",
            description = "where to write the figures (default: ${DEFAULT-VALUE})")
    Path out;

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() {
        Bench.Options o;
        try {
            o = new Bench.Options(server.jdbcUrl, server.user, server.passwordEnv, rows, vars, repeat, historyWaves, historyRows,
                    breakdowns);
        } catch (IllegalArgumentException e) {
            throw new org.wavewarden.config.ConfigException("bench", e.getMessage());
        }
        var log = spec.commandLine().getOut();
        BenchReport r = Bench.run(o, log);
        try {
            Path parent = out.toAbsolutePath().getParent();
            if (parent != null) {
                Files.createDirectories(parent);
            }
            Files.writeString(out, Json.mapper().writerWithDefaultPrettyPrinter().writeValueAsString(r),
                    StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write " + out, e);
        }
        log.println("wrote " + out);
        return Main.OK;
    }
}
