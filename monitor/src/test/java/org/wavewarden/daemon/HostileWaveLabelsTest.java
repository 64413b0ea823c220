package org.wavewarden.daemon;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.pipeline.Session;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.PreparedStatement;
import java.time.Clock;
import java.time.Duration;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Wave labels come from the source table, and a label is never a path: waves labelled {@code ../../x}, with an
 * absolute path, empty, blank, with a newline or a tab get their findings and digests inside the output folder,
 * each in a folder of its own.
 */
class HostileWaveLabelsTest {

    @TempDir
    Path dir;

    @Test
    void wavesWithPathLikeOrBlankLabelsAreWrittenInsideTheOutputFolderEachInItsOwnFolder() throws Exception {
        String url = TestDatabase.freshDatabase("hostile_labels");
        SmallSurvey.createTable(url);
        Path[] csv = SmallSurvey.writeWaves(dir);
        Path config = dir.resolve("c.yaml");
        Path outputDir = dir.resolve("deep").resolve("digests");
        String yaml = SmallSurvey.config(url, null) + "daemon:\n  httpPort: -1\n  outputDir: \""
                + outputDir.toString().replace("\\", "/") + "\"\n";
        Files.writeString(config, yaml);
        assertEquals(0, CliRun.of("import", "--config", config.toString(), "--wave", "w1", csv[0].toString())
                .exitCode());
        // An absolute label inside the test's own folder, so that the old behaviour could not touch the machine.
        List<String> labels = List.of("../../x", dir.resolve("elsewhere").toString(), "", " ", "\n", "\t",
                "line\nbreak");
        try (Connection c = TestDatabase.connect(url);
             PreparedStatement st = c.prepareStatement("INSERT INTO src.answers SELECT ?, respondent_id, score, region,"
                     + " satisfied, has_car, remark, spread FROM src.answers WHERE wave = 'w1'")) {
            for (String label : labels) {
                st.setString(1, label);
                st.executeUpdate();
            }
        }
        WardenConfig cfg = ConfigLoader.parse(yaml);
        try (Session s = Session.open(cfg, null, Map.of());
             Daemon d = new Daemon(s, Clock.systemUTC(), new Daemon.Retry(1, Duration.ofMillis(10),
                     Duration.ofMillis(10)), Map.of())) {
            s.migrate();
            d.fireWithRetries("small-survey");
        }
        assertEquals(labels.size() + 1, DaemonIntegrationTest.count(url, "SELECT count(*) FROM ww_results.run"));

        List<Path> outsideOutput = new ArrayList<>();
        List<Path> findings = new ArrayList<>();
        try (Stream<Path> all = Files.walk(dir)) {
            for (Path p : (Iterable<Path>) all.filter(Files::isRegularFile)::iterator) {
                String name = p.getFileName().toString();
                boolean output = name.equals("findings.json") || name.startsWith("digest.");
                if (output && !p.toAbsolutePath().normalize().startsWith(outputDir.toAbsolutePath().normalize())) {
                    outsideOutput.add(p);
                }
                if (name.equals("findings.json")) {
                    findings.add(p);
                }
            }
        }
        assertEquals(List.of(), outsideOutput, "outputs written outside the output folder");
        Set<Path> waveFolders = new HashSet<>();
        findings.forEach(f -> waveFolders.add(f.getParent()));
        assertEquals(labels.size() + 1, waveFolders.size(), "one folder per wave: " + waveFolders);
        assertTrue(Files.list(dir).noneMatch(p -> p.getFileName().toString().equals("x")
                || p.getFileName().toString().equals("elsewhere")));
    }
}
