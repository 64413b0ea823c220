package org.wavewarden.pipeline;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.MethodOrderer;
import org.junit.jupiter.api.Order;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestMethodOrder;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.deliver.DigestRecords;
import org.wavewarden.deliver.MarkdownDigest;
import org.wavewarden.deliver.WaveStatus;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.AlertView;
import org.wavewarden.review.ReviewException;
import org.wavewarden.review.ReviewReason;
import org.wavewarden.review.SignOff;
import org.wavewarden.store.AlertReviews;
import org.wavewarden.store.SignOffs;
import org.wavewarden.testing.TestDatabase;

import java.sql.Connection;
import java.time.Clock;
import java.time.Instant;
import java.time.ZoneOffset;
import java.time.format.DateTimeFormatter;
import java.util.List;
import java.util.Locale;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The digest of a wave as its review goes on, read from real stored alerts on a real PostgreSQL server: a wave of
 * 400 households where {@code score} rises (a MATERIAL shift) and {@code height_cm} gets 999 for one household in
 * eight (a sentinel). First every alert is open and the wave is not signed off; then one alert is explained, the
 * wave is signed off by force while the MATERIAL alert is open, and the MATERIAL alert is muted; each step shows in
 * the status line and the sections of both digests.
 */
@TestMethodOrder(MethodOrderer.OrderAnnotation.class)
class DigestReviewIntegrationTest {

    static final DateTimeFormatter WHEN =
            DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm 'UTC'", Locale.ROOT).withZone(ZoneOffset.UTC);

    static WardenConfig config;
    static Session session;
    static JudgedWave judged;
    static AlertReviews reviews;
    static SignOffs signOffs;

    @BeforeAll
    static void setUp() throws Exception {
        String url = TestDatabase.freshDatabase("digestreview");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE SCHEMA src;
                    CREATE TABLE src.hh (wave text NOT NULL, pid integer NOT NULL, score double precision,
                        height_cm double precision, region text);
                    INSERT INTO src.hh SELECT 'w1', p, 40 + (p * 7) % 21, 150 + (p * 11) % 41,
                        (ARRAY['north', 'south', 'east', 'west'])[1 + p % 4] FROM generate_series(1, 400) p;
                    INSERT INTO src.hh SELECT 'w2', p, 46 + (p * 7) % 21 + (p * 13) % 5 - 2,
                        CASE WHEN p % 8 = 0 THEN 999 ELSE 150 + (p * 11) % 41 END,
                        (ARRAY['north', 'south', 'east', 'west'])[1 + p % 4] FROM generate_series(1, 400) p;
                    """);
        }
        config = ConfigLoader.parse("source:\n  jdbcUrl: \"" + url + "\"\n  user: postgres\nresults:\n"
                + "  schema: hh_results\nalpha: 0.05\ndatasets:\n"
                + "  - name: hh\n    table: src.hh\n    waveColumn: wave\n    variables:\n"
                + "      - {name: score, kind: continuous, unit: points}\n"
                + "      - {name: height_cm, kind: continuous, unit: cm}\n"
                + "      - {name: region, kind: categorical}\n");
        session = Session.open(config, null, Map.of());
        session.migrate();
        WaveJudge judge = new WaveJudge(session, Clock.systemUTC());
        judge.judge(config.dataset("hh"), "w1", null, null, null);
        judged = judge.judge(config.dataset("hh"), "w2", null, null, null);
        reviews = new AlertReviews(session.store().jdbi(), config.results().schema());
        signOffs = new SignOffs(session.store().jdbi(), config.results().schema());
    }

    @AfterAll
    static void tearDown() {
        session.close();
    }

    static DatasetConfig dataset() {
        return config.dataset("hh");
    }

    static WaveStatus status() {
        DigestRecords records = new DigestAssembler(session).records(dataset(), List.of(judged.report()));
        return records.status("hh", "w2").orElseThrow();
    }

    static String markdown() {
        return new DigestAssembler(session).markdown(dataset(), List.of(judged.report()));
    }

    static String html() {
        return new DigestAssembler(session).html(dataset(), List.of(judged.report()), Instant.now());
    }

    static AlertView alertOf(String variable) {
        return reviews.list(new AlertReviews.Filter("hh", "w2", null, null, null)).stream()
                .filter(a -> a.variable().equals(variable) && a.state() != AlertState.SUPERSEDED).findFirst()
                .orElseThrow(() -> new AssertionError("no alert of " + variable));
    }

    @Test
    @Order(1)
    void beforeAnyReviewEveryAlertOfTheWaveIsOpenAndTheWaveIsNotSignedOff() {
        int alerts = judged.alerts().size();
        // The score rises by about 6 points and one height in eight is the sentinel 999; the regions are unchanged.
        assertEquals(List.of("height_cm", "score"), judged.alerts().stream().map(a -> a.variable()).sorted().toList());
        assertEquals("MATERIAL", alertOf("score").verdict());
        String line = "Alerts: " + alerts + " open, 0 explained, 0 muted. Not signed off.";
        assertTrue(markdown().contains("**Review status:** " + line), markdown());
        assertTrue(html().contains("<b>Review status:</b> " + line + "</p>"));
        assertFalse(markdown().contains("### Explained") || markdown().contains("### Muted"));
    }

    /** Waits for the stored alert histories: {@link AlertReviews#explain}. */
    @Test
    @Order(2)
    void anExplainedAlertLeavesTheOpenCountAndShowsItsReasonNoteAndWho() {
        AlertView height = alertOf("height_cm");
        reviews.explain(height.alertId(), "Ruth Penhallow", ReviewReason.FIX_UPSTREAM,
                "Scale recalibrated, the supplier resends w2", "command");
        int alerts = judged.alerts().size();
        WaveStatus s = status();
        assertEquals(alerts - 1, s.count(AlertState.OPEN));
        assertEquals(1, s.count(AlertState.EXPLAINED));
        assertEquals("Ruth Penhallow", s.explained().get(0).entry().actor());
        String md = markdown();
        assertTrue(md.contains("**Review status:** Alerts: " + (alerts - 1) + " open, 1 explained, 0 muted. Not"
                + " signed off."), md);
        String item = md.lines().dropWhile(l -> !l.equals("### Explained (1)")).filter(l -> l.startsWith("- "))
                .findFirst().orElseThrow(() -> new AssertionError(md));
        assertTrue(item.startsWith("- height\\_cm (") && item.contains("a data error being fixed upstream. Note:"
                + " Scale recalibrated, the supplier resends w2. By Ruth Penhallow on "), item);
        assertTrue(md.contains(" (explained) | height\\_cm"), "the alert table marks the row: " + md);
        assertTrue(html().contains("<h3>Explained (1)</h3>"));
        assertTrue(html().contains("data-variable=\"height_cm\"") && html().contains("data-state=\"EXPLAINED\""));
    }

    /** Waits for stored sign-offs: {@link SignOffs#signOff} and {@link SignOffs#latest}. */
    @Test
    @Order(3)
    void aForcedSignOffShowsWhoWhenAndTheReasonItWasForced() {
        assertThrows(ReviewException.class, () -> signOffs.signOff(new SignOffs.Request("hh", "w2", "r1",
                "Tom Oakes", false, null)), "the MATERIAL score alert is open");
        assertTrue(markdown().contains("Not signed off."), "a refused sign-off is no sign-off");
        SignOff so = signOffs.signOff(new SignOffs.Request("hh", "w2", "r1", "Tom Oakes", true,
                "score rise confirmed by the field team"));
        String signed = "Signed off by Tom Oakes on " + WHEN.format(so.signedAt()) + " (release r1; forced: score"
                + " rise confirmed by the field team).";
        assertTrue(markdown().contains(signed), markdown());
        assertTrue(html().contains(signed + "</p>"));
    }

    /** Waits for the stored alert histories: {@link AlertReviews#mute}. */
    @Test
    @Order(4)
    void aMutedAlertLeavesTheOpenCountAndIsListedWithItsExpiry() {
        AlertView score = alertOf("score");
        reviews.mute(score.alertId(), "Sam Treloar", "w3", null, ReviewReason.REAL_CHANGE,
                "Known rise, watched by the analysts", "command");
        int alerts = judged.alerts().size();
        WaveStatus s = status();
        assertEquals(alerts - 2, s.count(AlertState.OPEN));
        assertEquals(1, s.count(AlertState.MUTED));
        String md = markdown();
        assertTrue(md.contains("Alerts: " + (alerts - 2) + " open, 1 explained, 1 muted. Signed off by Tom Oakes"),
                md);
        String item = md.lines().dropWhile(l -> !l.equals("### Muted: recorded, not delivered (1)"))
                .filter(l -> l.startsWith("- ")).findFirst().orElseThrow(() -> new AssertionError(md));
        assertTrue(item.startsWith("- score (") && item.contains(": muted until wave w3") && item.contains(
                "accepted as a real change. Note: Known rise, watched by the analysts. By Sam Treloar on "), item);
        assertTrue(html().contains("<h3>Muted: recorded, not delivered (1)</h3>"));
        assertEquals(markdown(), MarkdownDigest.render(List.of(judged.report()),
                new DigestAssembler(session).records(dataset(), List.of(judged.report()))));
    }
}
