package org.wavewarden.compare.domain;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The heterogeneity Wald test: with uncorrelated domain estimates its closed form (Cochran's Q) equals the contrast
 * form through the eigendecomposition; correlated or badly scaled estimates take the contrast form. The references
 * against R survey 4.1.1 are in {@code BreakdownsReproduceSurveyTest}; this is a property over invented values.
 */
class WaldTest {

    @ParameterizedTest(name = "{0} domains")
    @ValueSource(ints = {2, 3, 6, 17, 60, 300})
    void uncorrelatedEstimatesGiveTheContrastFormInClosedForm(int m) {
        Random rnd = new Random(m);
        for (int trial = 0; trial < 20; trial++) {
            double[] change = new double[m];
            double[][] v = new double[m][m];
            List<Integer> all = new ArrayList<>();
            for (int i = 0; i < m; i++) {
                change[i] = rnd.nextGaussian() * 0.05;
                v[i][i] = Math.pow(10, -6 + 3 * rnd.nextDouble()); // variances over three orders of magnitude
                all.add(i);
            }
            assertTrue(Wald.independent(v, all));
            Wald closed = Wald.cochran(change, v, all);
            Wald general = Wald.contrasts(change, v, all);
            assertEquals(general.df(), closed.df());
            assertEquals(general.statistic(), closed.statistic(), 1e-9 * general.statistic());
            assertEquals(general.pValue(), closed.pValue(), 1e-9);
            assertEquals(general.statistic(), Wald.ofChanges(change, v).statistic(), 1e-9 * general.statistic());
        }
    }

    @Test
    void correlatedOrBadlyScaledEstimatesTakeTheContrastForm() {
        double[][] correlated = {{1, 0.2, 0}, {0.2, 1, 0}, {0, 0, 1}};
        assertFalse(Wald.independent(correlated, List.of(0, 1, 2)));
        double[][] scaled = {{1, 0, 0}, {0, 1e-7, 0}, {0, 0, 1}};
        assertFalse(Wald.independent(scaled, List.of(0, 1, 2)));
        double[] change = {0.1, -0.2, 0.3};
        assertEquals(Wald.contrasts(change, correlated, List.of(0, 1, 2)), Wald.ofChanges(change, correlated));
    }

    @Test
    void twoDomainsGiveTheSquaredZOfTheirDifference() {
        // With two uncorrelated domains, W is ((d1 - d2) / sqrt(v1 + v2))^2 on 1 df.
        double[] change = {0.12, -0.03};
        double[][] v = {{0.0004, 0}, {0, 0.0009}};
        double z = (0.12 + 0.03) / Math.sqrt(0.0013);
        Wald w = Wald.ofChanges(change, v);
        assertEquals(1, w.df());
        assertEquals(z * z, w.statistic(), 1e-12);
    }
}
