package org.wavewarden.demo;

import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.db.EmbeddedServer;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.deliver.MarkdownDigest;
import org.wavewarden.load.CsvWaveImporter;
import org.wavewarden.pipeline.CatalogCheck;
import org.wavewarden.pipeline.JudgedWave;
import org.wavewarden.pipeline.Session;
import org.wavewarden.pipeline.WaveJudge;

import java.io.IOException;
import java.io.InputStream;
import java.io.PrintWriter;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.SQLException;
import java.time.Clock;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;

/**
 * The demo end to end: starts an embedded PostgreSQL server, creates the demo's source table, imports every demo
 * wave with the same CSV importer users run, judges each wave against the previous one and writes the outputs.
 * The scenario, its config and its schema travel inside the jar, so the demo needs nothing but Java.
 */
public final class DemoRun {

    private DemoRun() {
    }

    public record Outcome(Path outDir, List<FindingsReport> reports) {
    }

    public static Outcome run(Path outDir, PrintWriter out) {
        try (EmbeddedServer server = EmbeddedServer.start()) {
            out.println("started an embedded PostgreSQL server on 127.0.0.1:" + server.port());
            WardenConfig config = ConfigLoader.parse(resource("/config/demo.yaml"));
            DatasetConfig d = config.datasets().get(0);
            createSourceTables(server);
            Path staging = Files.createTempDirectory("wavewarden-demo");
            try (Connection c = DriverManager.getConnection(server.jdbcUrl())) {
                for (String file : DemoScenarioGenerator.WAVES.stream().map(DemoWave::fileName).toList()) {
                    Path csv = staging.resolve(file);
                    try (InputStream in = DemoRun.class.getResourceAsStream("/demo-data/waves/" + file)) {
                        Files.copy(in, csv, StandardCopyOption.REPLACE_EXISTING);
                    }
                    String wave = file.replaceFirst("\\.csv(\\.gz)?$", "");
                    var r = CsvWaveImporter.load(c, Identifiers.TableName.parse("table", d.table()), d.waveColumn(),
                            wave, csv, false, null);
                    out.println("imported wave " + wave + ": " + r.rows() + " rows");
                }
            }
            List<FindingsReport> reports = new ArrayList<>();
            try (Session s = Session.open(config, server, Map.of())) {
                s.migrate();
                s.source().useHandle(h -> CatalogCheck.verify(h, config));
                WaveJudge judge = new WaveJudge(s, Clock.systemUTC());
                for (var w : judge.waves(d)) {
                    JudgedWave j = judge.judge(d, w.wave(), null, outDir.resolve(w.wave()), null);
                    reports.add(j.report());
                    out.println(summary(j));
                }
                Files.createDirectories(outDir);
                Files.writeString(outDir.resolve("digest.html"), new org.wavewarden.pipeline.DigestAssembler(s)
                        .html(d, reports, java.time.Instant.now()), StandardCharsets.UTF_8);
            }
            Files.writeString(outDir.resolve("digest.md"), MarkdownDigest.render(reports), StandardCharsets.UTF_8);
            return new Outcome(outDir, reports);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        } catch (SQLException e) {
            throw new IllegalStateException("demo database step failed: " + e.getMessage(), e);
        }
    }

    static String summary(JudgedWave j) {
        FindingsReport r = j.report();
        StringBuilder sb = new StringBuilder("judged " + r.wave()
                + (r.againstWave() == null ? " (first wave, screened alone)" : " against " + r.againstWave()) + ": "
                + j.alerts().size() + " alert(s)");
        j.alerts().forEach(a -> sb.append("\n    ").append(a.verdict() == null ? a.kind().name() : a.verdict().name())
                .append("  ").append(a.variable()).append(": ").append(a.sentence()));
        return sb.toString();
    }

    private static void createSourceTables(EmbeddedServer server) throws SQLException {
        try (Connection c = DriverManager.getConnection(server.jdbcUrl());
             var st = c.createStatement()) {
            st.execute(resource("/db/demo/V1__demo_source_tables.sql"));
        }
    }

    static String resource(String path) {
        try (InputStream in = DemoRun.class.getResourceAsStream(path)) {
            if (in == null) {
                throw new IllegalStateException("the build is missing " + path);
            }
            return new String(in.readAllBytes(), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
