package org.wavewarden.pipeline;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.bench.SyntheticSurvey;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.judge.Finding;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.profile.WaveProfile;
import org.wavewarden.read.BinaryWaveScanner;
import org.wavewarden.read.SourceCatalog;
import org.wavewarden.read.SourceColumn;
import org.wavewarden.read.WaveScanner;
import org.wavewarden.read.WaveSource;
import org.wavewarden.testing.SyntheticDatasets;
import org.wavewarden.testing.TestDatabase;

import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.time.Clock;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.function.Function;
import java.util.stream.Collectors;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The fast path (one binary COPY tallied in primitive tables, summaries stored and read back, relative bins for
 * columns with many distinct values) concludes what a straightforward computation concludes from the raw rows: every
 * row fetched with a plain SELECT, every value counted as the driver returns it, the same statistics applied. Where
 * nothing is summarised the findings are identical; where a column is summarised they agree within its stated
 * error.
 */
class FastPathEqualsRawComputationTest {

    static String url;
    static WardenConfig config;
    static Session session;

    @BeforeAll
    static void setUp() throws Exception {
        url = TestDatabase.freshDatabase("rawpath");
        try (Connection c = TestDatabase.connect(url)) {
            table(c, "t20", 20, 3000, 0.11);
            table(c, "t10", 10, 8000, -0.42);
            table(c, "t30", 30, 1500, 0.73);
        }
        config = SyntheticDatasets.config(url, "raw_results", "t20", "t10", "t30");
        session = Session.open(config, null, Map.of());
        session.migrate();
    }

    @AfterAll
    static void tearDown() {
        session.close();
    }

    private static void table(Connection c, String name, int vars, long rows, double seed) throws Exception {
        SyntheticSurvey.createTable(c, "gen", name, vars);
        SyntheticSurvey.insertWave(c, "gen", name, vars, "1", rows, 0, seed);
        SyntheticSurvey.insertWave(c, "gen", name, vars, "2", rows, 2, seed / 2);
    }

    @ParameterizedTest(name = "{0}, numbers exact up to {1} distinct values")
    @CsvSource({"t20, 10000", "t10, 10000", "t30, 10000", "t20, 300", "t10, 500"})
    void theFastPathConcludesWhatTheRawRowsSay(String dataset, int exactNumbers) throws Exception {
        DatasetConfig d = config.dataset(dataset);
        session.store().jdbi().useHandle(h -> h.execute("DELETE FROM raw_results.wave_summary"));
        List<Finding> fast = new WaveJudge(session, Clock.systemUTC())
                .useScanner(new BinaryWaveScanner(WaveScanner.DEFAULT_MAX_DISTINCT, exactNumbers)::scan)
                .judge(d, "2", null, null, null).report().findings();
        WaveProfile rawCurrent = rawProfile(d, "2");
        WaveProfile rawBaseline = rawProfile(d, "1");
        // The run chooses each location test from the series' first waves, here wave 1 alone; so does this side.
        List<Finding> raw = WaveJudge.findings(config, d, rawCurrent, rawBaseline,
                WaveJudge.screen(d, rawCurrent, rawBaseline), null,
                new org.wavewarden.compare.LocationHistory(List.of(rawBaseline), "1")).findings();

        Map<String, Finding> byKey = index(raw);
        assertEquals(byKey.keySet(), index(fast).keySet(), "the same findings");
        WaveProfile summarised = session.store().latestSummary(dataset, "1").orElseThrow().profile();
        boolean anySummarised = summarised.columns().values().stream().anyMatch(t -> !t.binning().isExact());
        for (Finding f : fast) {
            Finding r = byKey.get(key(f));
            ColumnTally t = summarised.columns().get(f.variable());
            if (!anySummarised) {
                assertEquals(r, f, "identical when nothing is summarised: " + key(f));
                continue;
            }
            if (t == null || t.binning().isExact()) {
                // The variable's own numbers are exact; its q-value shares the run with summarised variables.
                assertEquals(java.util.Arrays.asList(r.test(), r.statistic(), r.pValue(), r.effect(), r.verdict()),
                        java.util.Arrays.asList(f.test(), f.statistic(), f.pValue(), f.effect(), f.verdict()),
                        key(f));
                if (r.qValue() != null) {
                    assertEquals(r.qValue(), f.qValue(), 0.05 * r.qValue(), "q of " + key(f));
                }
                continue;
            }
            assertEquals(r.verdict(), f.verdict(), key(f));
            assertEquals(r.nBaseline(), f.nBaseline(), key(f));
            assertEquals(r.nCurrent(), f.nCurrent(), key(f));
            if (r.effect() != null) {
                assertEquals(r.effect().estimate(), f.effect().estimate(),
                        0.005 + 0.01 * Math.abs(r.effect().estimate()), "effect of " + key(f));
            }
            if (r.pValue() != null && r.pValue() > 1e-6) {
                assertEquals(Math.log(r.pValue()), Math.log(f.pValue()), 0.1, "p of " + key(f));
            }
        }
        assertEquals(exactNumbers < 1000, anySummarised, "columns are summarised only beyond the exact limit");
    }

    private static Map<String, Finding> index(List<Finding> findings) {
        return findings.stream().collect(Collectors.toMap(FastPathEqualsRawComputationTest::key, Function.identity(),
                (a, b) -> a, LinkedHashMap::new));
    }

    private static String key(Finding f) {
        return f.variable() + "/" + f.kind();
    }

    /** A wave counted from its raw rows: each value as the driver's getString returns it, NULL apart. */
    private static WaveProfile rawProfile(DatasetConfig d, String wave) throws Exception {
        List<SourceColumn> all = session.source().withHandle(h -> SourceCatalog.columns(h,
                WaveSource.of(d, "dataset").tableFor(wave)));
        Map<String, ColumnType> schema = new LinkedHashMap<>();
        all.forEach(c -> schema.put(c.name(), c.type()));
        List<SourceColumn> monitored = all.stream()
                .filter(c -> !c.name().equals("wave") && !c.name().equals("respondent_id")).toList();
        Map<String, Map<String, Long>> counts = new LinkedHashMap<>();
        Map<String, Long> nulls = new HashMap<>();
        long rows = 0;
        try (Connection c = TestDatabase.connect(url);
             PreparedStatement ps = c.prepareStatement("SELECT * FROM gen." + d.name() + " WHERE wave = ?")) {
            ps.setString(1, wave);
            try (ResultSet rs = ps.executeQuery()) {
                while (rs.next()) {
                    rows++;
                    for (SourceColumn col : monitored) {
                        String v = rs.getString(col.name());
                        if (v == null) {
                            nulls.merge(col.name(), 1L, Long::sum);
                        } else {
                            counts.computeIfAbsent(col.name(), k -> new HashMap<>()).merge(v, 1L, Long::sum);
                        }
                    }
                }
            }
        }
        Map<String, ColumnTally> columns = new LinkedHashMap<>();
        for (SourceColumn col : monitored) {
            columns.put(col.name(), new ColumnTally(col.name(), col.type(), rows, nulls.getOrDefault(col.name(), 0L),
                    counts.getOrDefault(col.name(), Map.of()), false));
        }
        return new WaveProfile(wave, rows, schema, columns);
    }
}
