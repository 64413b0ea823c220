package org.wavewarden.testing;

import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.pipeline.JudgedWave;
import org.wavewarden.pipeline.Session;
import org.wavewarden.pipeline.WaveJudge;
import org.wavewarden.store.AlertReviews;

import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.time.Clock;
import java.util.Map;

/**
 * A survey of 400 households in waves w1, w2 and w3, in a fresh database of the test server, with its results schema
 * migrated and waves w1 and w2 judged: the review tests' common ground. {@code score} rises by 6 points in w2 (a
 * MATERIAL shift); {@code region} does not change; w3 repeats w2 exactly and is left for the test to judge. With
 * {@code heightSentinel}, the survey also has {@code height_cm}, which gets the sentinel 999 for one household in
 * eight in w2 (a data-quality alert).
 *
 * @param url     the database, for reading tables directly
 * @param w2      the judged wave w2, with its alerts
 * @param reviews the alerts of the results schema
 */
public record HouseholdWaves(String url, WardenConfig config, Session session, AlertReviews reviews, JudgedWave w2)
        implements AutoCloseable {

    /**
     * @param database      the prefix of the fresh database's name
     * @param resultsSchema where the results are kept
     */
    public static HouseholdWaves judged(String database, String resultsSchema, boolean heightSentinel)
            throws SQLException {
        String url = TestDatabase.freshDatabase(database);
        String height = heightSentinel ? " height_cm," : "";
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("CREATE SCHEMA src;"
                    + " CREATE TABLE src.hh (wave text NOT NULL, pid integer NOT NULL, score double precision,"
                    + (heightSentinel ? " height_cm double precision," : "") + " region text);"
                    + " INSERT INTO src.hh SELECT 'w1', p, 40 + (p * 7) % 21,"
                    + (heightSentinel ? " 150 + (p * 11) % 41," : "")
                    + " (ARRAY['north', 'south', 'east', 'west'])[1 + p % 4] FROM generate_series(1, 400) p;"
                    + " INSERT INTO src.hh SELECT 'w2', p, 46 + (p * 7) % 21,"
                    + (heightSentinel ? " CASE WHEN p % 8 = 0 THEN 999 ELSE 150 + (p * 11) % 41 END," : "")
                    + " (ARRAY['north', 'south', 'east', 'west'])[1 + p % 4] FROM generate_series(1, 400) p;"
                    + " INSERT INTO src.hh SELECT 'w3', pid, score," + height + " region FROM src.hh"
                    + " WHERE wave = 'w2';");
        }
        WardenConfig config = ConfigLoader.parse("source:\n  jdbcUrl: \"" + url + "\"\n  user: postgres\nresults:\n"
                + "  schema: " + resultsSchema + "\nalpha: 0.05\ndatasets:\n"
                + "  - name: hh\n    table: src.hh\n    waveColumn: wave\n    exclude: [pid]\n    variables:\n"
                + "      - {name: score, kind: continuous, unit: points}\n"
                + (heightSentinel ? "      - {name: height_cm, kind: continuous, unit: cm}\n" : "")
                + "      - {name: region, kind: categorical}\n");
        Session session = Session.open(config, null, Map.of());
        try {
            session.migrate();
            WaveJudge judge = new WaveJudge(session, Clock.systemUTC());
            judge.judge(config.dataset("hh"), "w1", null, null, null);
            JudgedWave w2 = judge.judge(config.dataset("hh"), "w2", null, null, null);
            return new HouseholdWaves(url, config, session, new AlertReviews(session.store().jdbi(), resultsSchema),
                    w2);
        } catch (RuntimeException e) {
            session.close();
            throw e;
        }
    }

    /** The single number a query answers, e.g. a count of rows. */
    public long count(String sql) throws SQLException {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement();
             ResultSet rs = st.executeQuery(sql)) {
            rs.next();
            return rs.getLong(1);
        }
    }

    @Override
    public void close() {
        session.close();
    }
}
