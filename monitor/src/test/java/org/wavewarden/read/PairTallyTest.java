package org.wavewarden.read;

import org.jdbi.v3.core.Handle;
import org.jdbi.v3.core.Jdbi;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.wavewarden.config.Identifiers.TableName;
import org.wavewarden.profile.JointTally;
import org.wavewarden.profile.PairCounter;
import org.wavewarden.testing.TestDatabase;

import java.util.HashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The joint tallies a scan keeps for relationship drift are what PostgreSQL itself counts: a GROUP BY of the two
 * columns over the rows where both are finite numbers. Beyond the budget of exact pairs, the summary keeps every row
 * and comes out the same whatever order the server streams the rows in.
 */
class PairTallyTest {

    static Handle h;

    @BeforeAll
    static void setUp() {
        h = Jdbi.create(TestDatabase.freshDatabase("pairs"), "postgres", "").open();
        h.execute("""
                CREATE SCHEMA src;
                CREATE TABLE src.answers (wave text, id integer, age smallint, hours integer, income numeric(12,2),
                                          score real, ratio double precision, region text);
                """);
        h.execute("SELECT setseed(0.5)");
        // A wave with ties, codes, NULLs in either column, NaN and infinities in the floating columns.
        h.execute("""
                INSERT INTO src.answers
                SELECT 'small', i,
                       CASE WHEN i % 41 = 0 THEN NULL WHEN i % 29 = 0 THEN -9 ELSE 16 + (random() * 70)::int END,
                       CASE WHEN i % 37 = 0 THEN NULL WHEN i % 31 = 0 THEN 999 ELSE (random() * 60)::int END,
                       CASE WHEN i % 43 = 0 THEN NULL ELSE round((random() * 4000)::numeric, -1) END,
                       CASE WHEN i % 47 = 0 THEN 'NaN'::real WHEN i % 53 = 0 THEN '-0'::real
                            ELSE (random() * 10)::int / 2.0 END,
                       CASE WHEN i % 59 = 0 THEN 'Infinity'::float8 WHEN i % 61 = 0 THEN NULL
                            ELSE round((random() * 100)::numeric, 1)::float8 END,
                       (ARRAY['north', 'south'])[1 + (random())::int]
                FROM generate_series(1, 6000) AS i
                """);
        // A wave with far more distinct pairs than are kept exactly, in two tables of opposite physical order.
        h.execute("""
                INSERT INTO src.answers
                SELECT 'large', i, 16 + (random() * 80)::int,
                       CASE WHEN i % 97 = 0 THEN -9 ELSE (random() * 80)::int END,
                       round((exp(random() * 8) * 100)::numeric, 2), random() * 100, exp(random() * 20 - 10), 'x'
                FROM generate_series(1, 40000) AS i
                """);
        h.execute("CREATE TABLE src.forward AS SELECT * FROM src.answers WHERE wave = 'large' ORDER BY id");
        h.execute("CREATE TABLE src.backward AS SELECT * FROM src.answers WHERE wave = 'large' ORDER BY id DESC");
    }

    @AfterAll
    static void tearDown() {
        h.close();
    }

    static final List<PairSpec> PAIRS = List.of(new PairSpec("age", "hours"), new PairSpec("income", "score"),
            new PairSpec("ratio", "age"), new PairSpec("score", "ratio"));

    private static List<SourceColumn> columns(String table) {
        return SourceCatalog.columns(h, TableName.parse("table", table)).stream()
                .filter(c -> !c.name().equals("wave") && !c.name().equals("id")).toList();
    }

    private static WaveScanner.WaveScan binary(String table, String wave) {
        WaveSource s = new WaveSource(TableName.parse("table", table), "wave", null);
        return new BinaryWaveScanner(WaveScanner.DEFAULT_MAX_DISTINCT).scan(h, s, wave, columns(table), null, null,
                PAIRS, null);
    }

    private static WaveScanner.WaveScan text(String table, String wave) {
        WaveSource s = new WaveSource(TableName.parse("table", table), "wave", null);
        return new TextWaveScanner(WaveScanner.DEFAULT_MAX_DISTINCT).scan(h, s, wave, columns(table), null, null, PAIRS,
                null);
    }

    /** PostgreSQL's own count of each pair of finite values, as doubles (real widened exactly, numeric rounded). */
    private static Map<List<Double>, Long> groupBy(PairSpec p, String wave) {
        String x = org.wavewarden.config.Identifiers.quote(p.x()) + "::float8";
        String y = org.wavewarden.config.Identifiers.quote(p.y()) + "::float8";
        Map<List<Double>, Long> out = new HashMap<>();
        h.createQuery("SELECT " + x + " AS x, " + y + " AS y, count(*) AS n FROM src.answers WHERE wave = :w"
                        + " AND " + x + " NOT IN ('NaN', 'Infinity', '-Infinity')"
                        + " AND " + y + " NOT IN ('NaN', 'Infinity', '-Infinity') GROUP BY 1, 2")
                .bind("w", wave)
                .map((rs, ctx) -> {
                    out.put(List.of(rs.getDouble("x") + 0.0, rs.getDouble("y") + 0.0), rs.getLong("n"));
                    return null;
                }).list();
        return out;
    }

    private static Map<List<Double>, Long> asMap(JointTally t) {
        Map<List<Double>, Long> out = new HashMap<>();
        for (int i = 0; i < t.entries(); i++) {
            out.put(List.of(t.xs()[i], t.ys()[i]), t.counts()[i]);
        }
        return out;
    }

    @Test
    void eachPairIsCountedAsAGroupByOfTheTwoColumnsCountsIt() {
        WaveScanner.WaveScan scan = binary("src.answers", "small");
        assertEquals(PAIRS.size(), scan.pairs().size());
        for (int j = 0; j < PAIRS.size(); j++) {
            JointTally t = scan.pairs().get(j);
            assertTrue(t.of(PAIRS.get(j).x(), PAIRS.get(j).y()), "in the order asked: " + t);
            assertTrue(t.binning().isExact(), t.toString());
            assertEquals(groupBy(PAIRS.get(j), "small"), asMap(t), PAIRS.get(j).toString());
        }
        assertEquals(text("src.answers", "small"), scan, "the text scanner counts the same");
    }

    @Test
    void beyondTheBudgetTheSummaryKeepsEveryRowWhateverTheRowOrder() {
        WaveScanner.WaveScan forward = binary("src.forward", "large");
        WaveScanner.WaveScan backward = binary("src.backward", "large");
        assertEquals(forward.pairs(), backward.pairs(), "the same rows in the opposite order");
        assertEquals(forward, text("src.backward", "large"), "and the text scanner agrees");
        for (int j = 0; j < PAIRS.size(); j++) {
            JointTally t = forward.pairs().get(j);
            long both = groupBy(PAIRS.get(j), "large").values().stream().mapToLong(Long::longValue).sum();
            assertEquals(both, t.pairCount(), "every row with both numbers: " + t);
            assertTrue(t.entries() <= PairCounter.DEFAULT_MAX_PAIRS, t.toString());
        }
        JointTally incomeScore = forward.pairs().get(1);
        assertTrue(incomeScore.binning().level() >= PairCounter.FIRST_SUMMARY_LEVEL, incomeScore.toString());
        JointTally ageHours = forward.pairs().get(0);
        assertTrue(ageHours.binning().isExact(), "81 x 81 ages and hours fit exactly: " + ageHours);
        assertTrue(asMap(ageHours).keySet().stream().anyMatch(k -> k.get(1) == -9.0));
    }

    @Test
    void aWeightAndASamplingDesignReadInTheSamePassLeaveThePairsAsTheyAre() {
        WaveSource s = new WaveSource(TableName.parse("table", "src.answers"), "wave", null);
        List<SourceColumn> all = SourceCatalog.columns(h, TableName.parse("table", "src.answers"));
        SourceColumn id = all.stream().filter(c -> c.name().equals("id")).findFirst().orElseThrow();
        SourceColumn region = all.stream().filter(c -> c.name().equals("region")).findFirst().orElseThrow();
        List<SourceColumn> answers = columns("src.answers").stream().filter(c -> !c.name().equals("region")).toList();
        WaveScanner.WaveScan designed = new BinaryWaveScanner(WaveScanner.DEFAULT_MAX_DISTINCT).scan(h, s, "small",
                answers, id, new WaveScanner.Design(null, region), PAIRS, null);
        assertTrue(designed.design() != null, "the design was read too");
        assertEquals(binary("src.answers", "small").pairs(), designed.pairs());
    }

    @Test
    void aPairOfATextColumnIsRefusedBeforeTheScan() {
        var e = assertThrows(IllegalArgumentException.class, () -> new BinaryWaveScanner(10).scan(h,
                new WaveSource(TableName.parse("table", "src.answers"), "wave", null), "small",
                columns("src.answers"), null, null, List.of(new PairSpec("age", "region")), null));
        assertTrue(e.getMessage().contains("column region is text, not a number"), e.getMessage());
    }
}
