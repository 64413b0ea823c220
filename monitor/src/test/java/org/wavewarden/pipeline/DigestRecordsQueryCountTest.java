package org.wavewarden.pipeline;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.jdbi.v3.core.statement.SqlLogger;
import org.wavewarden.bench.StatementCounter;
import org.wavewarden.deliver.WaveStatus;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.AlertView;
import org.wavewarden.review.ReviewReason;
import org.wavewarden.store.AlertReviews;
import org.wavewarden.testing.HouseholdWaves;

import java.time.LocalDate;
import java.time.ZoneOffset;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * What the review status of a digest costs the results schema: for each wave one statement listing its alerts with
 * their latest entries and one reading its sign-off, however many of the alerts people explained or muted. The entry
 * shown for an explained or muted alert is the one that put it there, read with the list; no alert's history is
 * read on its own.
 */
class DigestRecordsQueryCountTest {

    static HouseholdWaves households;

    @BeforeAll
    static void setUp() throws Exception {
        households = HouseholdWaves.judged("digestcount", "dc_results", true);
    }

    @AfterAll
    static void tearDown() {
        households.close();
    }

    /** The statements one digest's records send, and the wave's status they give. */
    record Measured(StatementCounter.SourceStatements statements, WaveStatus status) {
    }

    static Measured records() {
        // The counter splits statements naming alert_action (the list's latest-entry join, or any history read)
        // from the rest (the sign-off).
        StatementCounter counter = new StatementCounter("alert_action");
        var jdbi = households.session().store().jdbi();
        jdbi.setSqlLogger(counter);
        try {
            WaveStatus status = new DigestAssembler(households.session())
                    .records(households.config().dataset("hh"), List.of(households.w2().report()))
                    .status("hh", "w2").orElseThrow();
            return new Measured(counter.snapshot(), status);
        } finally {
            jdbi.setSqlLogger(SqlLogger.NOP_SQL_LOGGER);
        }
    }

    static long alert(String variable) {
        return households.reviews().list(new AlertReviews.Filter("hh", "w2", null, null, null)).stream()
                .filter(a -> a.variable().equals(variable)).map(AlertView::alertId).findFirst().orElseThrow();
    }

    @Test
    void theStatementsAreTheSameForNoneOneAndTwoReviewedAlerts() {
        StatementCounter.SourceStatements perWave = new StatementCounter.SourceStatements(1, 1, 0, 0);
        Measured none = records();
        assertEquals(perWave, none.statements());
        assertEquals(List.of(), none.status().explained());

        long score = alert("score");
        households.reviews().explain(score, "Ines Harrow", ReviewReason.PLANNED_CHANGE, "new show card in w2",
                "command");
        Measured one = records();
        assertEquals(perWave, one.statements());
        assertEquals(1, one.status().explained().size());

        long height = alert("height_cm");
        households.reviews().mute(height, "Ines Harrow", "w3", LocalDate.now(ZoneOffset.UTC).plusDays(30),
                ReviewReason.FIX_UPSTREAM, "sentinel removed at the source", "command");
        Measured two = records();
        assertEquals(perWave, two.statements());
        assertEquals(1, two.status().explained().size());
        assertEquals(1, two.status().muted().size());

        // The entries shown are the ones that explained and muted, with their people and reasons.
        var explained = two.status().explained().get(0);
        assertEquals(score, explained.alert().alertId());
        assertEquals(AlertState.EXPLAINED, explained.alert().state());
        assertEquals("new show card in w2", explained.entry().note());
        assertEquals(ReviewReason.PLANNED_CHANGE, explained.entry().reason());
        var muted = two.status().muted().get(0);
        assertEquals(height, muted.alert().alertId());
        assertEquals("w3", muted.entry().untilWave());
        assertEquals(ReviewReason.FIX_UPSTREAM, muted.entry().reason());
        assertEquals("Ines Harrow", muted.entry().actor());
    }
}
