package org.wavewarden.bench;

import org.wavewarden.config.Identifiers;

import java.sql.Connection;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * An invented survey of any size, generated inside PostgreSQL: one table with a {@code wave} column, a respondent
 * id, and {@code vars} variables whose kinds repeat in a cycle of ten with the discreteness survey answers have:
 * heaped ages, a five-point scale with a "don't know" code, regions with blanks, rounded incomes with a refusal
 * code, a one-decimal measurement, a yes/no answer, an interview date, an amount in cents, an eleven-point scale
 * with two missing codes, and a truly continuous score. Later waves move some variables a little, so a judged
 * wave has real findings to write. The row values come from the server's {@code random()} after
 * {@code setseed}, so a seed gives the same table on the same server version.
 */
public final class SyntheticSurvey {

    /** The kinds of the variable cycle, in order; variable {@code i} (from 1) has kind {@code (i - 1) % 10}. */
    public static final List<String> KINDS = List.of("age", "scale5", "region", "income", "bmi", "yes_no",
            "interview_date", "amount", "scale11", "score");

    private SyntheticSurvey() {
    }

    /** The variable column names for {@code vars} variables, e.g. {@code v01_age}. */
    public static List<String> columnNames(int vars) {
        List<String> out = new ArrayList<>(vars);
        for (int i = 1; i <= vars; i++) {
            out.add(String.format(Locale.ROOT, "v%02d_%s", i, KINDS.get((i - 1) % KINDS.size())));
        }
        return out;
    }

    /** Creates (or replaces) the schema's table with the wave, id and variable columns; no rows. */
    public static void createTable(Connection c, String schema, String table, int vars) throws SQLException {
        if (vars < 1) {
            throw new IllegalArgumentException("vars must be at least 1, was " + vars);
        }
        String t = Identifiers.quote(schema) + "." + Identifiers.quote(table);
        StringBuilder ddl = new StringBuilder("CREATE TABLE " + t + " (wave text NOT NULL, respondent_id bigint NOT NULL");
        List<String> names = columnNames(vars);
        for (int i = 0; i < vars; i++) {
            ddl.append(", ").append(names.get(i)).append(' ').append(type(i % KINDS.size()));
        }
        ddl.append(')');
        try (Statement st = c.createStatement()) {
            st.execute("CREATE SCHEMA IF NOT EXISTS " + Identifiers.quote(schema));
            st.execute("DROP TABLE IF EXISTS " + t);
            // One draw decides whether an age is heaped on a multiple of five; a function sees it once.
            st.execute("CREATE OR REPLACE FUNCTION " + Identifiers.quote(schema) + ".heaped(a float8, u float8)"
                    + " RETURNS float8 LANGUAGE sql IMMUTABLE AS"
                    + " 'SELECT CASE WHEN u < 0.2 THEN round(a / 5) * 5 ELSE round(a) END'");
            st.execute(ddl.toString());
        }
    }

    /**
     * Appends one wave of {@code rows} respondents. {@code shift} (0 for a first wave, 1, 2, ... later) moves the
     * age, income, score and yes/no share a little and the interview dates by a quarter.
     */
    public static void insertWave(Connection c, String schema, String table, int vars, String wave, long rows,
                                  int shift, double seed) throws SQLException {
        if (rows < 0) {
            throw new IllegalArgumentException("rows must not be negative, was " + rows);
        }
        if (!(seed >= -1 && seed <= 1)) {
            throw new IllegalArgumentException("seed must be in [-1, 1] as setseed wants, was " + seed);
        }
        String t = Identifiers.quote(schema) + "." + Identifiers.quote(table);
        StringBuilder sql = new StringBuilder("INSERT INTO " + t + " SELECT ?, g");
        for (int i = 0; i < vars; i++) {
            sql.append(",\n  ").append(expression(Identifiers.quote(schema), i % KINDS.size(), shift));
        }
        sql.append("\nFROM generate_series(1, ?) AS g");
        try (var seedSt = c.prepareStatement("SELECT setseed(?)")) {
            seedSt.setDouble(1, seed);
            seedSt.execute();
        }
        try (var ps = c.prepareStatement(sql.toString())) {
            ps.setString(1, wave);
            ps.setLong(2, rows);
            ps.executeUpdate();
        }
    }

    private static String type(int kind) {
        return switch (kind) {
            case 0 -> "smallint";
            case 1, 3, 8 -> "integer";
            case 2 -> "text";
            case 4, 9 -> "double precision";
            case 5 -> "boolean";
            case 6 -> "date";
            case 7 -> "numeric(10,2)";
            default -> throw new IllegalArgumentException("kind " + kind);
        };
    }

    /** A standard normal draw from two uniforms (Box and Muller 1958). */
    private static final String NORMAL = "(sqrt(-2 * ln(1 - random())) * cos(2 * pi() * random()))";

    // Only numbers computed here are written into the SQL text, never outside input.
    private static String expression(String schemaQuoted, int kind, int shift) {
        double s = shift;
        return switch (kind) {
            case 0 -> "CASE WHEN random() < 0.02 THEN NULL ELSE " + schemaQuoted + ".heaped(least(95, greatest(18, 46 + "
                    + (0.6 * s) + " + 16 * " + NORMAL + ")), random())::smallint END";
            case 1 -> "CASE WHEN random() < 0.03 THEN 9 WHEN random() < 0.02 THEN NULL"
                    + " ELSE 1 + least(4, floor(abs(" + NORMAL + ") * 1.6))::int END";
            case 2 -> "CASE WHEN random() < 0.02 THEN NULL WHEN random() < 0.02 THEN ''"
                    + " ELSE (ARRAY['north', 'south', 'east', 'west', 'centre', 'islands'])[1 + floor(random() * 6)::int] END";
            case 3 -> "CASE WHEN random() < 0.02 THEN -9 WHEN random() < 0.03 THEN NULL"
                    + " ELSE (round(exp(10.3 + " + (0.02 * s) + " + 0.7 * " + NORMAL + ") / 100) * 100)::int END";
            case 4 -> "CASE WHEN random() < 0.04 THEN NULL ELSE round((26 + 4.5 * " + NORMAL + ")::numeric, 1)::float8 END";
            case 5 -> "CASE WHEN random() < 0.05 THEN NULL ELSE random() < " + (0.55 + 0.02 * s) + " END";
            case 6 -> "DATE '2025-01-01' + " + (91 * shift) + " + floor(random() * 90)::int";
            case 7 -> "CASE WHEN random() < 0.03 THEN NULL ELSE round((random() * 500)::numeric, 2) END";
            case 8 -> "CASE WHEN random() < 0.04 THEN 99 WHEN random() < 0.02 THEN -1"
                    + " ELSE least(10, greatest(0, round(6 + 2 * " + NORMAL + ")))::int END";
            case 9 -> "CASE WHEN random() < 0.01 THEN NULL ELSE 100 + " + (0.5 * s) + " + 15 * " + NORMAL + " END";
            default -> throw new IllegalArgumentException("kind " + kind);
        };
    }
}
