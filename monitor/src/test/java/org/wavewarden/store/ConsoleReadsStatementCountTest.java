package org.wavewarden.store;

import org.jdbi.v3.core.Jdbi;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.postgresql.ds.PGSimpleDataSource;
import org.wavewarden.bench.ConsoleHistory;
import org.wavewarden.bench.StatementCounter;
import org.wavewarden.testing.TestDatabase;

import java.time.Clock;
import java.util.Comparator;
import java.util.Map;
import java.util.function.Function;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * No page reads row by row: each console read sends the same number of statements on a history of one dataset (4
 * waves of 40 variables, a few alerts) as on one of 50 datasets (6 waves of 60 variables, hundreds of alerts): a
 * statement per dataset, variable or alert would show as a difference. Counted with the bench's statement counter,
 * set as Jdbi's SQL logger.
 */
class ConsoleReadsStatementCountTest {

    static Jdbi jdbi;
    static final StatementCounter COUNTER = new StatementCounter("\"small\".\"finding\"");
    static final Map<String, ConsoleHistory.Size> HISTORIES = Map.of(
            "small", new ConsoleHistory.Size(1, 4, 40),
            "large", new ConsoleHistory.Size(50, 6, 60));

    @BeforeAll
    static void setUp() {
        PGSimpleDataSource ds = new PGSimpleDataSource();
        ds.setURL(TestDatabase.freshDatabase("console_count"));
        ds.setUser("postgres");
        jdbi = Jdbi.create(ds);
        HISTORIES.forEach((schema, size) -> {
            ResultsSchema.migrate(ds, schema);
            ConsoleHistory.write(jdbi, schema, size);
        });
        jdbi.setSqlLogger(COUNTER);
    }

    /** The statements one read sends on the history in {@code schema}. */
    static int statements(String schema, Function<ConsoleReads, Object> read) {
        ConsoleReads reads = new ConsoleReads(jdbi, schema, Clock.systemUTC());
        COUNTER.reset();
        Object result = read.apply(reads);
        int n = COUNTER.snapshot().total();
        assertTrue(result != null, "the read answered");
        return n;
    }

    static Object read(String page, ConsoleReads r, String schema) {
        Comparator<String> order = Comparator.naturalOrder();
        String dataset = ConsoleHistory.dataset(1);
        long finding = jdbi.withHandle(h -> h.createQuery("SELECT f.finding_id FROM \"" + schema + "\".finding f JOIN \""
                + schema + "\".alert a ON a.run_id = f.run_id AND a.variable = f.variable AND a.kind = f.kind"
                + " WHERE a.superseded_at IS NULL ORDER BY f.finding_id LIMIT 1").mapTo(Long.class).one());
        COUNTER.reset();
        return switch (page) {
            case "overview" -> r.datasets();
            case "grid" -> r.grid(dataset, ConsoleReads.GridFilter.ANY, order);
            case "grid filtered" -> r.grid(dataset, new ConsoleReads.GridFilter("SHIFT", "MATERIAL"), order);
            case "finding with an alert" -> r.finding(finding, order).orElseThrow();
            case "finding unknown" -> r.finding(-1, order);
            case "wave" -> r.wave(dataset, ConsoleHistory.wave(2)).orElseThrow();
            case "wave unknown" -> r.wave(dataset, "no such wave");
            case "search" -> r.search("q0", 1000);
            default -> throw new IllegalArgumentException(page);
        };
    }

    @ParameterizedTest(name = "{0}: {1} datasets, {2} waves, {3} variables")
    @CsvSource({
            "small, 1,  4, 40",
            "large, 50, 6, 60",
    })
    void theHistoriesAreAsLargeAsTheirNamesSay(String schema, int datasets, int waves, int variables) {
        ConsoleReads reads = new ConsoleReads(jdbi, schema, Clock.systemUTC());
        assertEquals(datasets, reads.datasets().size());
        ConsoleReads.Grid grid = reads.grid(ConsoleHistory.dataset(1), ConsoleReads.GridFilter.ANY,
                Comparator.naturalOrder());
        assertEquals(waves, grid.waves().size());
        assertEquals(variables, grid.rows().size());
        assertTrue(reads.datasets().stream().mapToInt(d -> d.byState().values().stream().mapToInt(i -> i).sum())
                .sum() > datasets, "alerts on the current runs");
    }

    @ParameterizedTest(name = "{0}: {1} statements")
    @CsvSource({
            "overview,              3",
            "grid,                  3",
            "grid filtered,         3",
            "finding with an alert, 4",
            "finding unknown,       1",
            "wave,                  5",
            "wave unknown,          5",
            "search,                1",
    })
    void aReadSendsTheSameStatementsOnASmallAndALargeHistory(String page, int expected) {
        int small = statements("small", r -> read(page, r, "small"));
        int large = statements("large", r -> read(page, r, "large"));
        assertEquals(expected, small, "small history");
        assertEquals(expected, large, "large history");
    }
}
