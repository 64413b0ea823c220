package org.wavewarden.store;

import org.flywaydb.core.Flyway;
import org.junit.jupiter.api.Test;
import org.postgresql.ds.PGSimpleDataSource;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.ReviewAction;
import org.wavewarden.review.ReviewEntry;
import org.wavewarden.testing.TestDatabase;
import org.jdbi.v3.core.Jdbi;

import java.sql.Connection;
import java.sql.ResultSet;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

/**
 * A results schema written before alert histories existed is migrated on a real PostgreSQL server: every alert
 * starts its history there, opened when it was created and superseded when it was, and runs are no longer
 * cascade-deleted.
 */
class AlertLifecycleMigrationTest {

    @Test
    void alertsRaisedBeforeHistoriesGetTheirOpenedAndSupersededEntries() throws Exception {
        String url = TestDatabase.freshDatabase("lifecycle_migration");
        PGSimpleDataSource ds = new PGSimpleDataSource();
        ds.setUrl(url);
        ds.setUser("postgres");
        Flyway.configure().dataSource(ds).schemas("old_results").defaultSchema("old_results").createSchemas(true)
                .locations("classpath:db/results").table("schema_history").target("12").load().migrate();
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    INSERT INTO old_results.run (run_id, dataset, wave, against_wave, summary_checksum, started_at,
                        finished_at, alpha, fdr_method, findings_count, alerts_count, superseded_at)
                    VALUES (1, 'hh', 'w2', 'w1', 'a', now(), now(), 0.05, 'BH', 1, 2, now()),
                           (2, 'hh', 'w2', 'w1', 'b', now(), now(), 0.05, 'BH', 1, 1, NULL);
                    INSERT INTO old_results.finding (run_id, variable, kind, sentence) VALUES (1, 'score', 'SHIFT', 's');
                    INSERT INTO old_results.alert (alert_id, run_id, dataset, wave, against_wave, variable, kind,
                        verdict, sentence, created_at, superseded_at)
                    VALUES (10, 1, 'hh', 'w2', 'w1', 'score', 'SHIFT', 'MATERIAL', 's', '2026-01-05T09:00:00Z',
                                '2026-01-06T09:00:00Z'),
                           (11, 2, 'hh', 'w2', 'w1', 'score', 'SHIFT', 'MATERIAL', 's', '2026-01-06T09:00:00Z', NULL);
                    """);
        }
        ResultsSchema.migrate(ds, "old_results");

        AlertReviews reviews = new AlertReviews(Jdbi.create(ds), "old_results");
        List<ReviewEntry> superseded = reviews.history(10);
        assertEquals(List.of(ReviewAction.OPENED, ReviewAction.SUPERSEDED),
                superseded.stream().map(ReviewEntry::action).toList());
        assertEquals(List.of("wavewarden", "wavewarden"), superseded.stream().map(ReviewEntry::actor).toList());
        assertEquals(List.of("migration", "migration"), superseded.stream().map(ReviewEntry::source).toList());
        assertEquals(java.time.Instant.parse("2026-01-05T09:00:00Z"), superseded.get(0).at(), "opened when created");
        assertEquals(java.time.Instant.parse("2026-01-06T09:00:00Z"), superseded.get(1).at());
        assertEquals(List.of(ReviewAction.OPENED), reviews.history(11).stream().map(ReviewEntry::action).toList());
        assertEquals(Map.of(10L, AlertState.SUPERSEDED, 11L, AlertState.OPEN), reviews.states(List.of(10L, 11L)));

        try (Connection c = TestDatabase.connect(url); var st = c.createStatement();
             ResultSet rs = st.executeQuery("SELECT count(*) FROM pg_constraint c JOIN pg_namespace n ON"
                     + " n.oid = c.connamespace WHERE n.nspname = 'old_results' AND c.contype = 'f'"
                     + " AND c.confdeltype = 'c'")) {
            rs.next();
            assertEquals(0, rs.getInt(1), "no foreign key of the results schema cascades a delete any more");
        }
        // No cascading key could also mean no key at all: a run its findings and alerts refer to cannot be deleted.
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            java.sql.SQLException refused = assertThrows(java.sql.SQLException.class,
                    () -> st.execute("DELETE FROM old_results.run WHERE run_id = 1"));
            assertEquals("23503", refused.getSQLState(), refused.getMessage());   // foreign_key_violation
        }
    }
}
