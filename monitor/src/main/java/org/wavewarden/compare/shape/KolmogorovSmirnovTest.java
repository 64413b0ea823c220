package org.wavewarden.compare.shape;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.TestResult;
import org.wavewarden.profile.NumericDistribution;

/**
 * Two-sample Kolmogorov-Smirnov test (Smirnov 1939) from two frequency tables.
 *
 * <p>D is the largest gap between the two empirical distribution functions, taken after each distinct pooled value
 * and computed in integer arithmetic. When n1 * n2 &lt; 10000 (R's rule) the p-value is exact: the share of the
 * C(n1 + n2, n1) orderings of the pooled sample whose lattice path stays within D, counted by the recursion of
 * Hodges (1957); with tied values the bound is checked only where the pooled value changes, which gives the exact
 * distribution conditional on the ties (Schröer &amp; Trenkler 1995, Computational Statistics &amp; Data Analysis
 * 20), as R 4.2's {@code psmirnov} does. Otherwise the p-value is the limiting Kolmogorov distribution at
 * sqrt(n1 n2 / (n1 + n2)) D (Kolmogorov 1933; Smirnov 1948).
 */
public final class KolmogorovSmirnovTest {

    static final long EXACT_LIMIT = 10_000;

    private KolmogorovSmirnovTest() {
    }

    public static KolmogorovSmirnovResult test(NumericDistribution baseline, NumericDistribution current) {
        Union u = Union.of(baseline, current);
        long nb = u.nBaseline;
        long nc = u.nCurrent;
        long cumB = 0;
        long cumC = 0;
        long best = 0; // max |cumC * nb - cumB * nc|, the gap scaled by nb * nc
        for (int k = 0; k < u.size(); k++) {
            cumB += u.baseline[k];
            cumC += u.current[k];
            long gap = Math.abs(Math.subtractExact(Math.multiplyExact(cumC, nb), Math.multiplyExact(cumB, nc)));
            best = Math.max(best, gap);
        }
        double product = (double) nb * nc;
        double d = best / product;
        boolean exact = product < EXACT_LIMIT;
        double p;
        if (exact) {
            p = 1 - exactLowerTail(d, u);
        } else {
            p = 1 - kolmogorovCdf(Math.sqrt(product / (nb + nc)) * d);
        }
        p = Math.max(0.0, Math.min(1.0, p));
        return new KolmogorovSmirnovResult(TestResult.withoutDf("Kolmogorov-Smirnov", d, p), d, exact);
    }

    /**
     * The limiting p-value {@code 1 - K(sqrt(n1 n2 / (n1 + n2)) d)} for sample sizes that need not be whole
     * numbers: with survey weights, Kish's effective sample sizes stand in for n1 and n2, the approximation that
     * treats a weighted wave as a simple random sample of its effective size (Kish, L. (1965), Survey Sampling,
     * Wiley, Section 11.7). For whole n1 and n2 with n1 n2 &gt;= 10000 it is the p-value of {@link #test}.
     */
    public static double asymptoticPValue(double d, double nBaseline, double nCurrent) {
        Checks.closedUnit(d, "d");
        if (!(nBaseline > 0 && nCurrent > 0) || Double.isInfinite(nBaseline) || Double.isInfinite(nCurrent)) {
            throw new IllegalArgumentException("nBaseline and nCurrent must be finite and positive, were "
                    + nBaseline + " and " + nCurrent);
        }
        double p = 1 - kolmogorovCdf(Math.sqrt(nBaseline * nCurrent / (nBaseline + nCurrent)) * d);
        return Math.max(0.0, Math.min(1.0, p));
    }

    /**
     * P(D &lt; d) under random assignment of the pooled sample to the two waves. The path takes a step for every
     * pooled observation; a path is admissible if, at every point where the pooled value changes, the gap between
     * the two partial distribution functions stays below d. Probabilities are propagated with the weights
     * i / (i + j), as in R's algorithm, which keeps them in [0, 1].
     */
    static double exactLowerTail(double d, Union u) {
        int m = (int) u.nBaseline;
        int n = (int) u.nCurrent;
        // R's rounding guard: a path is rejected once its gap reaches D, whatever the rounding of D
        double q = (0.5 + Math.floor(d * m * n - 1e-7)) / ((double) m * n);
        // pooled positions (i + j) after which the value changes: the only places the bound is checked
        boolean[] check = new boolean[m + n + 1];
        int pos = 0;
        for (int k = 0; k < u.size(); k++) {
            pos += (int) (u.baseline[k] + u.current[k]);
            check[pos] = true;
        }
        check[0] = true;
        // path[i][j] with i baseline and j current steps: count(i, j) / C(i + j, i), kept row by row in j
        double[] row = new double[n + 1];
        for (int j = 0; j <= n; j++) {
            row[j] = (check[j] && gap(0, j, m, n) > q) ? 0 : 1;
            if (j > 0 && row[j - 1] == 0) {
                row[j] = 0;
            }
        }
        for (int i = 1; i <= m; i++) {
            // entry (i, 0) is reached only from (i - 1, 0)
            row[0] = (check[i] && gap(i, 0, m, n) > q) ? 0 : row[0];
            for (int j = 1; j <= n; j++) {
                if (check[i + j] && gap(i, j, m, n) > q) {
                    row[j] = 0;
                } else {
                    // paths from (i - 1, j) and (i, j - 1); normalised counts combine as below
                    row[j] = row[j] * (double) i / (i + j) + row[j - 1] * (double) j / (i + j);
                }
            }
        }
        return row[n];
    }

    private static double gap(int i, int j, int m, int n) {
        return Math.abs((double) i / m - (double) j / n);
    }

    /**
     * Limiting distribution K(x) of sqrt(n) D: the theta-function series for x &lt; 1 and the alternating series
     * 1 - 2 sum (-1)^(k-1) exp(-2 k^2 x^2) otherwise, each of which converges within a few terms in its range.
     */
    static double kolmogorovCdf(double x) {
        if (x <= 0) {
            return 0;
        }
        if (x < 1) {
            double z = -(Math.PI * Math.PI / 8) / (x * x);
            double s = 0;
            for (int k = 1; k < 40; k += 2) {
                s += Math.exp(k * k * z);
            }
            return s * Math.sqrt(2 * Math.PI) / x;
        }
        double z = -2 * x * x;
        double sum = 1;
        for (int k = 1; k < 100; k++) {
            double term = 2 * Math.exp(k * k * z);
            sum += (k % 2 == 1) ? -term : term;
            if (term < 1e-17) {
                break;
            }
        }
        return sum;
    }
}
