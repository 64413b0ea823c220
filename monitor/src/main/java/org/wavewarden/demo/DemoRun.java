package org.wavewarden.demo;

import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.Codebooks;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.db.EmbeddedServer;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.deliver.MarkdownDigest;
import org.wavewarden.deliver.OutputPaths;
import org.wavewarden.deliver.ReleaseDigest;
import org.wavewarden.deliver.ReleaseReport;
import org.wavewarden.load.CaseImporter;
import org.wavewarden.load.CaseSource;
import org.wavewarden.load.CsvWaveImporter;
import org.wavewarden.load.spss.SavFiles;
import org.wavewarden.pipeline.CatalogCheck;
import org.wavewarden.pipeline.DigestAssembler;
import org.wavewarden.pipeline.JudgedWave;
import org.wavewarden.pipeline.ReleaseJudge;
import org.wavewarden.pipeline.Session;
import org.wavewarden.pipeline.WaveJudge;
import org.wavewarden.store.WaveCodebooks;

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
import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * The demo end to end: starts an embedded PostgreSQL server, creates the demo's source tables, imports every wave of
 * the three demo datasets with the same importers users run (CSV for the household survey and the panel; SPSS files
 * for the leisure survey, whose table the first wave's import creates and whose configuration names no variable: its
 * DDI codebook and each file's dictionary say what every variable is), judges each wave against the previous one,
 * compares the two publications of the panel's revised wave and writes the outputs. The scenario, its config, its
 * codebook and its schema travel inside the jar, so the demo needs nothing but Java.
 *
 * <p>Outputs: for the household survey, {@code digest.html} and {@code digest.md} in {@code outDir} and
 * {@code findings.json} + {@code digest.md} per wave in {@code outDir/<wave>/}; for the panel the same under
 * {@code outDir/harrowmere-panel/}, and the release comparison's {@code releases.json} and {@code releases.md} under
 * {@code outDir/harrowmere-panel/releases/<wave>/}; for the leisure survey the same under
 * {@code outDir/harrowmere-leisure/}; each {@code <wave>} folder is named by {@link OutputPaths#name}.
 */
public final class DemoRun {

    /** The folder, below the demo's output folder, that holds the panel's outputs. */
    public static final String PANEL_FOLDER = "harrowmere-panel";

    /** The folder, below the demo's output folder, that holds the leisure survey's outputs. */
    public static final String LEISURE_FOLDER = "harrowmere-leisure";

    /** Where the demo's config lies in the jar; it is staged beside the leisure codebook it names by relative path. */
    static final String CONFIG = "config/demo.yaml";

    private DemoRun() {
    }

    /**
     * What the demo judged and wrote.
     *
     * @param outDir       the output folder
     * @param reports      the household survey's judged waves, in time order
     * @param panelReports the panel's judged waves, in time order
     * @param release      the comparison of the panel's revised wave with its first publication
     * @param outputs      every file written, in the order written
     * @param leisureReports the leisure survey's judged waves, in time order
     * @param leisureImports each leisure wave's label and the dictionary its SPSS file was imported with
     */
    public record Outcome(Path outDir, List<FindingsReport> reports, List<FindingsReport> panelReports,
                          ReleaseReport release, List<Path> outputs, List<FindingsReport> leisureReports,
                          Map<String, DatasetCodebook> leisureImports) {
    }

    public static Outcome run(Path outDir, PrintWriter out) {
        return run(outDir, out, s -> { });
    }

    /**
     * The same, and {@code inspect} reads the results schema (the runs and their alert rows) before the demo's
     * server stops.
     */
    public static Outcome run(Path outDir, PrintWriter out, java.util.function.Consumer<Session> inspect) {
        try (EmbeddedServer server = EmbeddedServer.start()) {
            out.println("started an embedded PostgreSQL server on 127.0.0.1:" + server.port());
            Path staging = Files.createTempDirectory("wavewarden-demo");
            Path stagedConfig = stageConfig(staging);
            var resolved = Codebooks.resolve(ConfigLoader.load(stagedConfig), stagedConfig.getParent());
            resolved.report().forEach(out::println);
            WardenConfig config = resolved.config();
            DatasetConfig household = config.datasets().get(0);
            DatasetConfig panel = config.datasets().get(1);
            DatasetConfig leisure = config.dataset(LEISURE_FOLDER);
            createSourceTables(server);
            Map<String, DatasetCodebook> dictionaries;
            try (Connection c = DriverManager.getConnection(server.jdbcUrl())) {
                importWaves(c, household, "/demo-data/waves/",
                        DemoScenarioGenerator.WAVES.stream().map(DemoWave::fileName).toList(), staging, out);
                importWaves(c, panel, "/demo-data/panel/",
                        PanelScenarioGenerator.WAVES.stream().map(PanelScenarioGenerator::fileName).toList(), staging,
                        out);
                dictionaries = importSpssWaves(c, leisure, staging, out);
            }
            List<Path> outputs = new ArrayList<>();
            List<FindingsReport> reports;
            List<FindingsReport> panelReports;
            List<FindingsReport> leisureReports;
            ReleaseReport release;
            Path panelDir = outDir.resolve(PANEL_FOLDER);
            try (Session s = Session.open(config, server, Map.of())) {
                s.migrate();
                s.source().useHandle(h -> CatalogCheck.verify(h, config));
                // each wave is judged with the dictionary it was delivered with (labels, code frames)
                WaveCodebooks waveCodebooks = new WaveCodebooks(s.store().jdbi(), config.results().schema());
                Instant importedAt = Instant.now();
                dictionaries.forEach((wave, dictionary) -> waveCodebooks.save(leisure.name(), wave, dictionary,
                        importedAt));
                reports = judgeAll(s, household, outDir, out, outputs);
                panelReports = judgeAll(s, panel, panelDir, out, outputs);
                leisureReports = judgeAll(s, leisure, outDir.resolve(LEISURE_FOLDER), out, outputs);
                Path releaseDir = OutputPaths.under(panelDir.resolve("releases"), PanelScenarioGenerator.REVISED_WAVE);
                release = new ReleaseJudge(s, Clock.systemUTC()).compare(panel, PanelScenarioGenerator.REVISED_WAVE,
                        null, null, releaseDir, null);
                out.println("compared the releases of " + panel.name() + " wave " + release.wave() + ": "
                        + release.after() + " against " + release.before());
                out.print(ReleaseDigest.summary(release, false));
                outputs.add(releaseDir.resolve("releases.json"));
                outputs.add(releaseDir.resolve("releases.md"));
                inspect.accept(s);
            }
            out.println("wrote " + outputs.size() + " files:");
            outputs.forEach(p -> out.println("    " + outDir.relativize(p)));
            return new Outcome(outDir, reports, panelReports, release, List.copyOf(outputs), leisureReports,
                    dictionaries);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        } catch (SQLException e) {
            throw new IllegalStateException("demo database step failed: " + e.getMessage(), e);
        }
    }

    private static void importWaves(Connection c, DatasetConfig d, String folder, List<String> files, Path staging,
                                    PrintWriter out) throws IOException, SQLException {
        for (String file : files) {
            Path csv = staging.resolve(d.name() + "-" + file);
            copyResource(folder + file, csv);
            String wave = file.replaceFirst("\\.csv(\\.gz)?$", "");
            var r = CsvWaveImporter.load(c, Identifiers.TableName.parse("table", d.table()), d.waveColumn(), wave,
                    csv, false, null);
            out.println("imported " + d.name() + " wave " + wave + ": " + r.rows() + " rows");
        }
    }

    /**
     * Copies the demo's config and the leisure survey's DDI codebook out of the jar into the same layout as in the
     * repository ({@code config/demo.yaml} beside {@code demo-data/leisure/}), so the codebook path the config gives,
     * relative to the config file, resolves the same from a checkout and from the jar.
     */
    static Path stageConfig(Path staging) throws IOException {
        Path config = staging.resolve(CONFIG);
        copyResource("/" + CONFIG, config);
        copyResource("/demo-data/" + LeisureScenarioGenerator.FOLDER + "/" + LeisureScenarioGenerator.CODEBOOK_FILE,
                staging.resolve("demo-data").resolve(LeisureScenarioGenerator.FOLDER)
                        .resolve(LeisureScenarioGenerator.CODEBOOK_FILE));
        return config;
    }

    private static void copyResource(String resource, Path target) throws IOException {
        Files.createDirectories(target.getParent());
        try (InputStream in = DemoRun.class.getResourceAsStream(resource)) {
            if (in == null) {
                throw new IllegalStateException("the build is missing " + resource);
            }
            Files.copy(in, target, StandardCopyOption.REPLACE_EXISTING);
        }
    }

    /**
     * Imports the leisure survey's SPSS waves, the first creating the table from its dictionary, and gives each
     * wave's dictionary for the results store (which exists only once the session has migrated it).
     */
    private static Map<String, DatasetCodebook> importSpssWaves(Connection c, DatasetConfig d, Path staging,
                                                                PrintWriter out) throws IOException, SQLException {
        Map<String, DatasetCodebook> dictionaries = new LinkedHashMap<>();
        boolean first = true;
        for (LeisureScenarioGenerator.Wave w : LeisureScenarioGenerator.WAVES) {
            Path file = staging.resolve(d.name() + "-" + w.fileName());
            copyResource("/demo-data/" + LeisureScenarioGenerator.FOLDER + "/" + w.fileName(), file);
            try (CaseSource cases = SavFiles.open(file)) {
                var r = CaseImporter.load(c, Identifiers.TableName.parse("table", d.table()), d.waveColumn(), w.label(),
                        cases, false, first, out);
                dictionaries.put(w.label(), cases.codebook());
                out.println("imported " + d.name() + " wave " + w.label() + " from " + w.fileName() + ": " + r.rows()
                        + " rows, " + cases.codebook().variables().size() + " variables described by its dictionary");
            }
            first = false;
        }
        return dictionaries;
    }

    /** Judges every wave of a dataset and writes its findings and digests under {@code dir}. */
    private static List<FindingsReport> judgeAll(Session s, DatasetConfig d, Path dir, PrintWriter out,
                                                 List<Path> outputs) throws IOException {
        List<FindingsReport> reports = new ArrayList<>();
        WaveJudge judge = new WaveJudge(s, Clock.systemUTC());
        for (var w : judge.waves(d)) {
            Path waveDir = OutputPaths.under(dir, w.wave());
            JudgedWave j = judge.judge(d, w.wave(), null, waveDir, null);
            reports.add(j.report());
            outputs.add(waveDir.resolve("findings.json"));
            outputs.add(waveDir.resolve("digest.md"));
            out.println(d.name() + ": " + summary(j));
        }
        Files.createDirectories(dir);
        // The dataset's digests lie in its folder, beside the waves' folders holding the case lists.
        Files.writeString(dir.resolve("digest.html"), new DigestAssembler(s).html(d, reports, Instant.now(), ""),
                StandardCharsets.UTF_8);
        Files.writeString(dir.resolve("digest.md"), new DigestAssembler(s).markdown(d, reports, ""),
                StandardCharsets.UTF_8);
        outputs.add(dir.resolve("digest.html"));
        outputs.add(dir.resolve("digest.md"));
        return reports;
    }

    static String summary(JudgedWave j) {
        FindingsReport r = j.report();
        StringBuilder sb = new StringBuilder("judged " + r.wave()
                + (r.againstWave() == null ? " (first wave, screened alone)" : " against " + r.againstWave()) + ": "
                + j.alerts().size() + " alert(s)");
        j.alerts().forEach(a -> sb.append("\n    ").append(a.verdict() == null ? a.kind().name() : a.verdict().name())
                .append("  ").append(a.variable()).append(": ").append(a.lead().sentence())
                .append(a.facets().size() == 1 ? "" : " Also seen: " + a.facets().subList(1, a.facets().size())
                        .stream().map(o -> o.verdict() == null ? o.kind().name() : o.verdict() + " " + o.kind())
                        .collect(java.util.stream.Collectors.joining(", ")) + "."));
        return sb.toString();
    }

    private static void createSourceTables(EmbeddedServer server) throws SQLException {
        try (Connection c = DriverManager.getConnection(server.jdbcUrl());
             var st = c.createStatement()) {
            st.execute(resource("/db/demo/V1__demo_source_tables.sql"));
            st.execute(resource("/db/demo/V2__demo_panel_table.sql"));
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
