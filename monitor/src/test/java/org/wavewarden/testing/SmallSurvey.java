package org.wavewarden.testing;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.SQLException;
import java.util.Random;

/**
 * A small invented survey for integration tests: three waves of a few hundred respondents, with a clear shift
 * of {@code score} planted in the third wave, and in the same wave a tripled spread of {@code spread} around an
 * unchanged mean (a change of shape, not of location); nothing else moves.
 */
public final class SmallSurvey {

    private SmallSurvey() {
    }

    public static void createTable(String url) throws SQLException {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE SCHEMA IF NOT EXISTS src;
                    CREATE TABLE src.answers (
                        wave text NOT NULL,
                        respondent_id integer NOT NULL,
                        score double precision,
                        region text,
                        satisfied integer,
                        has_car boolean,
                        remark text,
                        spread double precision
                    );
                    """);
        }
    }

    /** Writes wave CSVs w1, w2, w3 into dir; returns their paths. */
    public static Path[] writeWaves(Path dir) throws IOException {
        Path[] out = new Path[3];
        Random r = new Random(42);
        String[] regions = {"north", "south", "east", "west"};
        for (int w = 1; w <= 3; w++) {
            StringBuilder sb = new StringBuilder("respondent_id,score,region,satisfied,has_car,remark,spread\n");
            for (int i = 0; i < 600; i++) {
                double shift = w == 3 ? 8 : 0;
                double score = Math.round((50 + shift + 10 * r.nextGaussian()) * 10) / 10.0;
                String region = regions[r.nextInt(4)];
                int sat = 1 + Math.min(4, (int) Math.floor(Math.abs(r.nextGaussian() * 1.5)));
                boolean car = r.nextDouble() < 0.6;
                String remark = r.nextDouble() < 0.2 ? "" : "note " + r.nextInt(100000);
                String remarkCsv = remark.isEmpty() ? "\"\"" : remark;
                sb.append(i).append(',').append(score).append(',').append(region).append(',').append(sat).append(',')
                        .append(car).append(',').append(r.nextDouble() < 0.5 ? "" : remarkCsv).append(',')
                        .append(Math.round((50 + (w == 3 ? 15 : 5) * r.nextGaussian()) * 100) / 100.0).append('\n');
            }
            out[w - 1] = dir.resolve("w" + w + ".csv");
            Files.writeString(out[w - 1], sb.toString(), StandardCharsets.UTF_8);
        }
        return out;
    }

    public static String config(String url, String extraVariables) {
        return """
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results:
                  schema: ww_results
                alpha: 0.05
                datasets:
                  - name: small-survey
                    table: src.answers
                    waveColumn: wave
                    exclude: [respondent_id]
                    variables:
                      - name: score
                        kind: continuous
                        unit: points
                      - name: region
                        kind: categorical
                      - name: spread
                        kind: continuous
                %s
                """.formatted(url, extraVariables == null ? "" : extraVariables);
    }
}
