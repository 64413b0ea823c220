package org.wavewarden.pipeline;

import org.jdbi.v3.core.Handle;
import org.jdbi.v3.core.Jdbi;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.bench.StatementCounter;
import org.wavewarden.compare.DesignViews;
import org.wavewarden.compare.design.DesignMeanDifference;
import org.wavewarden.compare.design.DesignMeanDifferenceResult;
import org.wavewarden.compare.design.PsuTotals;
import org.wavewarden.config.Breakdowns;
import org.wavewarden.config.CompareWith;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.DesignColumns;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.missing.ScreenedVariable;
import org.wavewarden.missing.ScreenedWave;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.DomainTally;
import org.wavewarden.profile.WaveProfile;
import org.wavewarden.read.BinaryWaveScanner;
import org.wavewarden.read.WaveScanner;
import org.wavewarden.read.WaveSource;
import org.wavewarden.testing.SyntheticDatasets;
import org.wavewarden.testing.TestDatabase;

import java.sql.Connection;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A wave summary with domains, read through {@link WaveJudge#readProfile}: one COPY per wave, a domain that feeds
 * the design-based comparison exactly as the whole wave with zero weights outside the domain does (domain
 * estimation), a pool of domains equal to the database's counts over the pooled waves, and a stored summary with
 * domains that reads back equal.
 */
class DomainSummaryIntegrationTest {

    static final String TABLE = "answers";
    static String url;
    static Handle h;

    @BeforeAll
    static void setUp() throws Exception {
        url = TestDatabase.freshDatabase("domain_summary");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute(org.wavewarden.read.DomainScanTest.ANSWERS);
            // The same rows, weights set to zero outside district GUL: the whole wave then estimates GUL's figures.
            st.execute("CREATE TABLE zeroed AS SELECT wave, stratum, psu, CASE WHEN district = 'GUL' THEN w ELSE 0 END"
                    + " AS w, district, mode, code, score, amount, height FROM answers");
        }
        h = Jdbi.create(url, "postgres", "").open();
    }

    @AfterAll
    static void tearDown() {
        h.close();
    }

    /** The dataset on {@code table}: weighted, stratified and clustered; mode is excluded, yet a breakdown. */
    static DatasetConfig dataset(String table, Breakdowns breakdowns) {
        return new DatasetConfig(table, "public." + table, "wave", null, null, CompareWith.PREVIOUS, null,
                List.of("mode"), List.of(), null, null, null, null, "w", null, null,
                new DesignColumns("stratum", "psu"), List.of(), null, null, null, breakdowns);
    }

    static Breakdowns byDistrictAndMode(int maxDomains) {
        return new Breakdowns(List.of("district", "mode", "not_a_column"), maxDomains, null,
                Breakdowns.DEFAULT_MIN_INTERVIEWS, List.of(), Breakdowns.DEFAULT_ICC_THRESHOLD,
                Breakdowns.DEFAULT_MAX_CASES);
    }

    static WaveSource source(String table) {
        return new WaveSource(new Identifiers.TableName("public", table), "wave", null);
    }

    static WaveProfile read(String table, Breakdowns b, String wave, WaveJudge.Scanner scanner) {
        return WaveJudge.readProfile(h, dataset(table, b), source(table), wave, scanner, null);
    }

    static WaveJudge.Scanner binary() {
        return new BinaryWaveScanner(1000, 1000)::scan;
    }

    @Test
    void breakdownsAreTalliedInTheWavesOneCopy() {
        StatementCounter counter = new StatementCounter(Identifiers.quote("public") + "." + Identifiers.quote(TABLE));
        WaveProfile p = read(TABLE, byDistrictAndMode(50), "w1", counter.counting(binary()));
        assertEquals(1, counter.snapshot().copies(), "one COPY for the wave and both breakdown columns");
        assertEquals(List.of("district", "mode"), p.domains().stream().map(DomainTally::column).toList(),
                "a configured column the table lacks has no domains");
        assertTrue(p.domains("mode").isPresent(), "an excluded column can be a breakdown");
        assertTrue(!p.columns().containsKey("mode"), "and stays unmonitored");
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource({"w1", "w2"})
    void aDomainEstimatesWhatTheWholeWaveWithZeroWeightsElsewhereEstimates(String wave) {
        WaveProfile gul = read(TABLE, byDistrictAndMode(50), wave, binary()).inDomain("district", "GUL").orElseThrow();
        WaveProfile zeroed = read("zeroed", Breakdowns.NONE, wave, binary());
        VariableConfig score = VariableConfig.inferred("score", VariableKind.CONTINUOUS);
        PsuTotals a = totals(gul, score);
        PsuTotals b = totals(zeroed, score);
        DesignMeanDifferenceResult r = DesignMeanDifference.test(a, b, 0.95);
        assertEquals(r.current().estimate(), r.baseline().estimate(), 1e-12, "the weighted mean");
        assertEquals(r.current().standardError(), r.baseline().standardError(), 1e-12,
                "its linearised standard error over every PSU of the wave");
        assertEquals(0.0, r.difference().estimate(), 1e-12);
        assertTrue(r.baseline().standardError() > 0);
        // Shares of a category: the PSU sums the design-based comparison reads are the zeroed wave's.
        List<String> order = List.of("a", "b", "c", "d");
        var sg = screened(gul, VariableConfig.inferred("code", VariableKind.CATEGORICAL));
        var sz = screened(zeroed, VariableConfig.inferred("code", VariableKind.CATEGORICAL));
        double[][] wg = DesignViews.categories(gul.design(), "code", sg, order).tally().weight();
        double[][] wz = DesignViews.categories(zeroed.design(), "code", sz, order).tally().weight();
        assertEquals(wz.length, wg.length);
        for (int i = 0; i < wz.length; i++) {
            org.junit.jupiter.api.Assertions.assertArrayEquals(wz[i], wg[i], 1e-9, order.get(i));
        }
    }

    /**
     * R's own domain estimate: svymean(~score, subset(design, district == "GUL" & !is.na(score) & score != -9))
     * (the screen takes the code -9 out of the valid answers) with
     * svydesign(ids = ~psu, strata = ~stratum, weights = ~w, nest = TRUE) on the same generated rows (NULL weights as
     * 0), R 4.2.2, survey 4.1.1. Subsetting a survey design object in R keeps every PSU of the design, which is the
     * domain estimation the summary's zero PSU sums give.
     */
    @ParameterizedTest(name = "{0}: mean {1}, SE {2}")
    @CsvSource({
            // wave, mean (R survey 4.1.1 svymean), SE (R survey 4.1.1 SE(svymean))
            "w1, 11.149110094500, 0.202245256855",
            "w2, 12.002741435503, 0.224357511679"})
    void aDomainsDesignBasedMeanIsRsSubsetEstimate(String wave, double mean, double se) {
        WaveProfile gul = read(TABLE, byDistrictAndMode(50), wave, binary()).inDomain("district", "GUL").orElseThrow();
        PsuTotals t = totals(gul, VariableConfig.inferred("score", VariableKind.CONTINUOUS));
        DesignMeanDifferenceResult r = DesignMeanDifference.test(t, t, 0.95);
        assertEquals(mean, r.current().estimate(), 1e-9);
        assertEquals(se, r.current().standardError(), 1e-9);
    }

    static ScreenedVariable screened(WaveProfile p, VariableConfig v) {
        return ScreenedWave.screen(p, true, List.of(v), List.of()).get(v.name()).orElseThrow();
    }

    static PsuTotals totals(WaveProfile p, VariableConfig v) {
        ColumnTally t = p.columns().get(v.name());
        DesignViews.View view = DesignViews.numeric(p.design(), t, screened(p, v), v);
        assertEquals(null, view.unavailable());
        return view.totals();
    }

    @ParameterizedTest(name = "{0} by {1}")
    @CsvSource({"district, score", "district, code", "mode, amount"})
    void pooledDomainsCountWhatTheDatabaseCountsOverBothWaves(String breakdown, String column) {
        WaveProfile pool = WaveProfile.pooled("w1+w2", List.of(read(TABLE, byDistrictAndMode(50), "w1", binary()),
                read(TABLE, byDistrictAndMode(50), "w2", binary())));
        DomainTally t = pool.domains(breakdown).orElseThrow();
        Map<String, Map<String, Long>> db = new HashMap<>();
        h.createQuery("SELECT " + breakdown + "::text AS dom, " + column + "::text AS v, count(*) AS n FROM answers"
                + " WHERE " + breakdown + " IS NOT NULL AND " + column + " IS NOT NULL GROUP BY 1, 2").mapToMap()
                .forEach(r -> db.computeIfAbsent((String) r.get("dom"), k -> new HashMap<>())
                        .put((String) r.get("v"), ((Number) r.get("n")).longValue()));
        assertEquals(db.keySet(), java.util.Set.copyOf(t.domains()));
        for (int d = 0; d < t.domains().size(); d++) {
            assertEquals(db.get(t.domains().get(d)), t.tallies().get(column).get(d).valueCounts(), t.domains().get(d));
        }
        assertTrue(t.designs().isEmpty(), "a pool has no design");
        assertEquals(t.tallies().keySet(), t.weights().keySet(), "both waves weighted: the pool keeps the weights");
    }

    @Test
    void aPoolDropsABreakdownNotEveryWaveHolds() {
        WaveProfile with = read(TABLE, byDistrictAndMode(50), "w1", binary());
        WaveProfile without = read(TABLE, Breakdowns.NONE, "w2", binary());
        assertTrue(WaveProfile.pooled("p", List.of(with, without)).domains().isEmpty());
    }

    @Test
    void aStoredSummaryWithDomainsReadsBackEqual() {
        WardenConfig cfg = SyntheticDatasets.config(url, "domain_results", TABLE);
        try (Session session = Session.open(cfg, null, Map.of())) {
            session.migrate();
            DatasetConfig d = dataset(TABLE, byDistrictAndMode(50));
            WaveProfile p = read(TABLE, byDistrictAndMode(50), "w1", binary());
            String key = SummaryKey.of(d, p.schema()).value();
            session.store().saveSummary(TABLE, p, p.checksum(), key);
            var stored = session.store().latestSummary(TABLE, "w1").orElseThrow();
            assertEquals(p.domains(), stored.profile().domains());
            assertEquals(p.checksum(), stored.profile().checksum());
            assertEquals(key, stored.summaryKey());
        }
    }

    @Test
    void domainsEnterTheChecksumAndTheSummaryKey() {
        WaveProfile with = read(TABLE, byDistrictAndMode(50), "w1", binary());
        WaveProfile without = read(TABLE, Breakdowns.NONE, "w1", binary());
        assertEquals(without.checksum(), new WaveProfile(with.wave(), with.rows(), with.schema(), with.columns(),
                with.weights(), with.design(), with.pairs()).checksum(), "the breakdowns add domains, nothing else");
        assertNotEquals(without.checksum(), with.checksum());
        String plain = SummaryKey.of(dataset(TABLE, Breakdowns.NONE), with.schema()).value();
        String fifty = SummaryKey.of(dataset(TABLE, byDistrictAndMode(50)), with.schema()).value();
        String three = SummaryKey.of(dataset(TABLE, byDistrictAndMode(3)), with.schema()).value();
        assertNotEquals(plain, fifty, "a summary stored before breakdowns is read again");
        assertNotEquals(fifty, three, "and so is one stored under another cap on domains");
    }

    @Test
    void aCappedBreakdownReadsThroughTheJudgeCountsItsOverflow() {
        WaveProfile p = read(TABLE, byDistrictAndMode(3), "w1", binary());
        DomainTally t = p.domains("district").orElseThrow();
        assertEquals(3, t.domains().size());
        assertEquals(2, t.overflowDomains(), "five districts, three kept");
        long all = h.createQuery("SELECT count(*) FROM answers WHERE wave = 'w1' AND district IS NOT NULL")
                .mapTo(Long.class).one();
        assertEquals(all, java.util.Arrays.stream(t.rows()).sum() + t.overflowRows());
    }
}
