package org.wavewarden.compare.location;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.location.LocationTestChoice.LocationTest;
import org.wavewarden.profile.NumericDistribution;

/** The choice of a continuous variable's location test from its first waves. */
class LocationTestChoiceHistoryTest {

    static NumericDistribution normal(Random r, int n) {
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = Math.round((30 + 6 * r.nextGaussian()) * 100) / 100.0;
        }
        return NumericDistribution.ofSample(x);
    }

    static NumericDistribution skewed(Random r, int n) {
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = Math.round(8 * Math.exp(1.5 * r.nextGaussian()) * 100) / 100.0;
        }
        return NumericDistribution.ofSample(x);
    }

    @Test
    void theChoiceChangesAtMostOnceFromMeansToRanksAndNeverAfterTheFirstWaves() {
        Random r = new Random(11);
        for (int rep = 0; rep < 200; rep++) {
            List<NumericDistribution> waves = new ArrayList<>();
            List<String> labels = new ArrayList<>();
            for (int w = 0; w < 9; w++) {
                int n = 9 + r.nextInt(21);
                waves.add(r.nextBoolean() ? normal(r, n) : skewed(r, n));
                labels.add("w" + w);
            }
            List<LocationTest> series = new ArrayList<>();
            for (int judged = 1; judged < waves.size(); judged++) {
                series.add(LocationTestChoice.fromHistory(labels.subList(0, judged), waves.subList(0, judged)).test());
            }
            int switches = 0;
            for (int i = 1; i < series.size(); i++) {
                if (series.get(i) != series.get(i - 1)) {
                    switches++;
                    assertEquals(LocationTest.MANN_WHITNEY, series.get(i), series.toString());
                }
                if (i >= LocationTestChoice.HISTORY_WAVES) {
                    assertEquals(series.get(i - 1), series.get(i), series.toString());
                }
            }
            assertTrue(switches <= 1, series.toString());
        }
    }

    @Test
    void wavesWithoutAnswersAreSkippedAndTheReasonNamesTheWavesUsed() {
        Random r = new Random(3);
        LocationTestChoice.Choice c = LocationTestChoice.fromHistory(List.of("q1", "q2", "q3"),
                List.of(NumericDistribution.empty(), normal(r, 40), normal(r, 40)));
        assertEquals(LocationTest.WELCH_T, c.test());
        assertTrue(c.reason().startsWith("Welch's t on means, chosen from waves q2, q3, the variable's first 2 waves"
                + " with answers, and kept for every later wave: none departs from a normal distribution"
                + " (q2: Shapiro-Wilk p = "), c.reason());
        assertThrows(IllegalArgumentException.class, () -> LocationTestChoice.fromHistory(List.of("q1"),
                List.of(NumericDistribution.empty())));
    }

    @Test
    void aPinIsTheTestWhateverTheData() {
        assertEquals(LocationTest.MANN_WHITNEY, LocationTestChoice.pinned(LocationTest.MANN_WHITNEY,
                "locationTest: ranks").test());
        assertEquals("Mann-Whitney on ranks, pinned in the configuration (locationTest: ranks)",
                LocationTestChoice.pinned(LocationTest.MANN_WHITNEY, "locationTest: ranks").reason());
    }
}
