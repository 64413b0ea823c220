package org.wavewarden.pipeline;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.sql.Connection;
import java.sql.PreparedStatement;
import java.time.Clock;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.VariableComparator;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.testing.TestDatabase;

/**
 * A continuous variable keeps one location test from wave to wave, whatever one wave's pre-test says, and a test
 * pinned in the configuration is the one used.
 */
class LocationTestHistoryIntegrationTest {

    static final String[] WAVES = {"w1", "w2", "w3", "w4", "w5"};
    /** Which waves are skewed: the pattern that made the two-wave rule take Mann-Whitney, Welch, Welch, Mann-Whitney. */
    static final boolean[] SKEWED = {true, false, false, false, true};
    static String url;

    @BeforeAll
    static void load() throws Exception {
        url = TestDatabase.freshDatabase("location_history");
        try (Connection c = TestDatabase.connect(url)) {
            c.createStatement().execute("CREATE SCHEMA src; CREATE TABLE src.minutes (wave text NOT NULL,"
                    + " respondent_id integer NOT NULL, minutes double precision, pinned double precision)");
            try (PreparedStatement st = c.prepareStatement("INSERT INTO src.minutes VALUES (?, ?, ?, ?)")) {
                for (int w = 0; w < WAVES.length; w++) {
                    double[] values = wave(20, SKEWED[w], w);
                    for (int i = 0; i < values.length; i++) {
                        st.setString(1, WAVES[w]);
                        st.setInt(2, i);
                        st.setDouble(3, values[i]);
                        st.setDouble(4, values[i]);
                        st.addBatch();
                    }
                }
                st.executeBatch();
            }
        }
    }

    /**
     * Twenty answers at the normal quantiles (Shapiro-Wilk p near 1) or at lognormal ones with sigma 1.3
     * (Shapiro-Wilk p 1.2e-5, scipy 1.17 shapiro), shifted a little each wave.
     */
    static double[] wave(int n, boolean skewed, int shift) {
        NormalDistribution z = new NormalDistribution(null, 0, 1);
        double[] out = new double[n];
        for (int i = 0; i < n; i++) {
            double q = z.inverseCumulativeProbability((i + 0.5) / n);
            out[i] = Math.round((skewed ? 8 * Math.exp(1.3 * q) : 30 + 6 * q) * 100) / 100.0 + shift;
        }
        return out;
    }

    static String config(String pin) {
        return """
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results:
                  schema: ww_results
                alpha: 0.05
                datasets:
                  - name: commutes
                    table: src.minutes
                    waveColumn: wave
                    exclude: [respondent_id]
                    variables:
                      - name: minutes
                        kind: continuous
                      - name: pinned
                        kind: continuous
                %s""".formatted(url, pin);
    }

    static List<Finding> shifts(String yaml, String variable) {
        WardenConfig c = ConfigLoader.parse(yaml);
        List<Finding> out = new ArrayList<>();
        try (Session s = Session.open(c, null, Map.of())) {
            s.migrate();
            WaveJudge judge = new WaveJudge(s, Clock.systemUTC());
            for (String w : WAVES) {
                judge.judge(c.datasets().get(0), w, null, null, null).report().findings().stream()
                        .filter(f -> f.variable().equals(variable) && f.kind() == FindingKind.SHIFT)
                        .forEach(out::add);
            }
        }
        return out;
    }

    @Test
    void aVariableWhoseWavesPassAndFailThePreTestKeepsOneTestAcrossFourWaves() {
        List<Finding> f = shifts(config(""), "minutes");
        assertEquals(List.of("Mann-Whitney U", "Mann-Whitney U", "Mann-Whitney U", "Mann-Whitney U"),
                f.stream().map(Finding::test).toList());
        for (Finding x : f) {
            String why = ((VariableComparator.LocationDetail) x.detail()).testChoice();
            assertTrue(why.startsWith("Mann-Whitney on ranks, chosen from wave"), why);
            assertTrue(why.contains("w1: departs from a normal distribution"), why);
        }
    }

    @Test
    void aPinnedVariableUsesItsPin() {
        List<Finding> f = shifts(config("        locationTest: means\n"), "pinned");
        assertEquals(4, f.size());
        for (Finding x : f) {
            assertEquals("Welch t", x.test(), x.sentence());
            assertEquals("Welch's t on means, pinned in the configuration (locationTest: means)",
                    ((VariableComparator.LocationDetail) x.detail()).testChoice());
        }
    }
}
