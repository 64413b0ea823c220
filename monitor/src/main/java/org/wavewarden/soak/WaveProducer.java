package org.wavewarden.soak;

import org.wavewarden.config.Identifiers;

import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.SQLException;
import java.sql.Statement;
import java.sql.Types;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;

/**
 * Adds the soak's survey waves to the source table: an invented quarterly check-in of Harrowmere County households,
 * each wave of 300 to 2,000 rows, with the answers of a steady population except where a wave plants an event
 * (a shift in one variable, or a burst of 999 codes keyed for heights that were not measured) so that the daemon
 * raises alerts. Each wave is one transaction, so the daemon never sees half a wave. A wave's content depends only
 * on the seed and its number.
 */
public final class WaveProducer {

    static final String TABLE = "wave";
    static final int MIN_ROWS = 300;
    static final int MAX_ROWS = 2_000;
    private static final String[] DISTRICTS = {"Ashcombe", "Brinley", "Corran", "Dunmere", "Elsworth", "Fallow"};

    /** What a wave holds besides steady answers. */
    public enum Plant {
        NONE, INCOME_SHIFT, AGE_SHIFT, DISTRICT_SHIFT, BROADBAND_SHIFT, SATISFACTION_SHIFT, HEIGHT_999_BURST
    }

    /** One wave written. */
    public record Wave(String label, int rows, Plant plant) {
    }

    private final String schema;
    private final long seed;
    private int next = 1;

    public WaveProducer(String schema, long seed) {
        this.schema = Identifiers.require("--source-schema", schema);
        this.seed = seed;
    }

    /** The table's name as the config gives it. */
    public String table() {
        return schema + "." + TABLE;
    }

    /** Creates the schema and the empty source table. */
    public void createTable(Connection c) throws SQLException {
        try (Statement st = c.createStatement()) {
            st.execute("CREATE SCHEMA " + Identifiers.quote(schema));
            st.execute("CREATE TABLE " + quoted() + " (wave text NOT NULL, respondent_id bigint NOT NULL,"
                    + " age integer, income_monthly double precision, district text, satisfaction integer,"
                    + " has_broadband text, height_cm double precision)");
        }
    }

    /** The config's variables, matching the table. */
    static String variablesYaml() {
        return """
                    variables:
                      - {name: age, kind: continuous, unit: years, range: {min: 16, max: 99}}
                      - {name: income_monthly, kind: continuous, unit: currency per month}
                      - {name: district, kind: categorical}
                      - {name: satisfaction, kind: ordinal, range: {min: 1, max: 5}}
                      - {name: has_broadband, kind: binary, successValue: "yes"}
                      - {name: height_cm, kind: continuous, unit: cm}
                """;
    }

    /** Writes the next wave in one transaction and returns it. */
    public Wave addWave(Connection c) throws SQLException {
        int n = next;
        SplittableRandom r = new SplittableRandom(seed * 1_000_003L + n);
        String label = String.format(Locale.ROOT, "W%04d", n);
        int rows = r.nextInt(MIN_ROWS, MAX_ROWS + 1);
        // A quarter of the waves carry an event; the wave after one returns to normal, which is a change too.
        Plant plant = n == 1 || r.nextDouble() >= 0.25 ? Plant.NONE
                : Plant.values()[1 + r.nextInt(Plant.values().length - 1)];
        boolean autoCommit = c.getAutoCommit();
        c.setAutoCommit(false);
        try (PreparedStatement ps = c.prepareStatement("INSERT INTO " + quoted()
                + " (wave, respondent_id, age, income_monthly, district, satisfaction, has_broadband, height_cm)"
                + " VALUES (?, ?, ?, ?, ?, ?, ?, ?)")) {
            for (int i = 0; i < rows; i++) {
                row(ps, r, label, n * 100_000L + i, plant);
                ps.addBatch();
            }
            ps.executeBatch();
            c.commit();
        } catch (SQLException | RuntimeException e) {
            c.rollback();
            throw e;
        } finally {
            c.setAutoCommit(autoCommit);
        }
        next++;
        return new Wave(label, rows, plant);
    }

    private static void row(PreparedStatement ps, SplittableRandom r, String label, long id, Plant plant)
            throws SQLException {
        int age = (int) Math.round(Math.max(16, Math.min(95, 46 + 16 * r.nextGaussian()
                + (plant == Plant.AGE_SHIFT ? 7 : 0))));
        double income = Math.exp(7.6 + 0.45 * r.nextGaussian()) * (plant == Plant.INCOME_SHIFT ? 1.3 : 1.0);
        int d = plant == Plant.DISTRICT_SHIFT && r.nextDouble() < 0.25 ? DISTRICTS.length - 1
                : r.nextInt(DISTRICTS.length);
        int satisfaction = Math.max(1, Math.min(5, 3 + (int) Math.round(r.nextGaussian())
                + (plant == Plant.SATISFACTION_SHIFT ? 1 : 0)));
        double broadband = plant == Plant.BROADBAND_SHIFT ? 0.62 : 0.78;
        ps.setString(1, label);
        ps.setLong(2, id);
        ps.setInt(3, age);
        ps.setDouble(4, Math.round(income * 100) / 100.0);
        ps.setString(5, DISTRICTS[d]);
        ps.setInt(6, satisfaction);
        // A few blanks, as any survey has: item non-response is not an event.
        if (r.nextDouble() < 0.02) {
            ps.setNull(7, Types.VARCHAR);
        } else {
            ps.setString(7, r.nextDouble() < broadband ? "yes" : "no");
        }
        if (plant == Plant.HEIGHT_999_BURST && r.nextDouble() < 0.08) {
            ps.setDouble(8, 999);
        } else {
            ps.setDouble(8, Math.round((168 + 9 * r.nextGaussian()) * 10) / 10.0);
        }
    }

    /** The labels of the waves in the table, in order. */
    public List<String> labels(Connection c) throws SQLException {
        List<String> out = new ArrayList<>();
        try (Statement st = c.createStatement();
             var rs = st.executeQuery("SELECT DISTINCT wave FROM " + quoted() + " ORDER BY wave")) {
            while (rs.next()) {
                out.add(rs.getString(1));
            }
        }
        return out;
    }

    private String quoted() {
        return Identifiers.quote(schema) + "." + Identifiers.quote(TABLE);
    }
}
