package org.wavewarden.compare.design;

import java.util.Arrays;
import java.util.HashMap;
import java.util.Map;

/**
 * The sampling design of one wave: a weight per respondent, the stratum and the primary sampling unit (PSU) each
 * respondent was drawn in. PSUs are treated as drawn with replacement within strata (the "ultimate cluster"
 * approximation, Kalton, G. (1979), "Ultimate cluster sampling", JRSS A 142, 210-222), which is what design-based
 * variances by Taylor linearisation need: only the PSU totals of the linearised values and the number of PSUs per
 * stratum enter.
 *
 * <p>PSU identifiers are nested in strata: the same PSU id in two strata names two different PSUs (as R's
 * {@code svydesign(..., nest = TRUE)}). A design without strata has one stratum; a design without clusters has each
 * respondent as its own PSU. Weights must be finite and strictly positive (a respondent with weight zero carries no
 * information here; remove such rows before building the design).
 *
 * <p>Instances are immutable; the arrays given to the factories are copied.
 */
public final class SurveyDesign {

    private final double[] weights;
    private final int[] stratumOf;
    private final int[] psuOf;
    private final int[] psuStratum;
    private final int[] psusInStratum;

    private SurveyDesign(double[] weights, int[] stratumOf, int[] psuOf, int[] psuStratum, int[] psusInStratum) {
        this.weights = weights;
        this.stratumOf = stratumOf;
        this.psuOf = psuOf;
        this.psuStratum = psuStratum;
        this.psusInStratum = psusInStratum;
    }

    /** Unequal weights only: one stratum, each respondent its own PSU (R: {@code svydesign(ids = ~1, weights = ~w)}). */
    public static SurveyDesign weightsOnly(double[] weights) {
        checkWeights(weights);
        return of(weights, new long[weights.length], ownPsus(weights.length));
    }

    /** Strata without clusters: each respondent its own PSU inside its stratum. */
    public static SurveyDesign stratified(double[] weights, long[] strata) {
        checkWeights(weights);
        checkLength("strata", strata, weights.length);
        return of(weights, strata, ownPsus(weights.length));
    }

    /** Clusters without strata: one stratum holding every PSU. */
    public static SurveyDesign clustered(double[] weights, long[] psus) {
        checkWeights(weights);
        checkLength("psus", psus, weights.length);
        return of(weights, new long[weights.length], psus);
    }

    /**
     * Stratified cluster design.
     *
     * @param weights sampling (or analysis) weights, finite and strictly positive
     * @param strata  stratum id of each respondent
     * @param psus    PSU id of each respondent, nested in its stratum
     */
    public static SurveyDesign stratifiedClustered(double[] weights, long[] strata, long[] psus) {
        checkWeights(weights);
        checkLength("strata", strata, weights.length);
        checkLength("psus", psus, weights.length);
        return of(weights, strata, psus);
    }

    /**
     * Both waves as one design with disjoint strata, so the two samples are independent: strata are
     * wave x stratum and PSUs stay nested. Baseline respondents come first.
     */
    static SurveyDesign stack(SurveyDesign baseline, SurveyDesign current) {
        int n1 = baseline.size();
        int n = n1 + current.size();
        int h1 = baseline.strataCount();
        int p1 = baseline.psuCount();
        double[] w = new double[n];
        int[] s = new int[n];
        int[] c = new int[n];
        for (int i = 0; i < n; i++) {
            boolean first = i < n1;
            SurveyDesign d = first ? baseline : current;
            int j = first ? i : i - n1;
            w[i] = d.weights[j];
            s[i] = d.stratumOf[j] + (first ? 0 : h1);
            c[i] = d.psuOf[j] + (first ? 0 : p1);
        }
        int[] psuStratum = new int[p1 + current.psuCount()];
        for (int k = 0; k < psuStratum.length; k++) {
            psuStratum[k] = k < p1 ? baseline.psuStratum[k] : current.psuStratum[k - p1] + h1;
        }
        int[] perStratum = new int[h1 + current.strataCount()];
        System.arraycopy(baseline.psusInStratum, 0, perStratum, 0, h1);
        System.arraycopy(current.psusInStratum, 0, perStratum, h1, current.strataCount());
        return new SurveyDesign(w, s, c, psuStratum, perStratum);
    }

    private static SurveyDesign of(double[] weights, long[] strata, long[] psus) {
        int n = weights.length;
        Map<Long, Integer> strataIndex = new HashMap<>();
        Map<PsuKey, Integer> psuIndex = new HashMap<>();
        int[] s = new int[n];
        int[] c = new int[n];
        int[] psuStratum = new int[n];
        for (int i = 0; i < n; i++) {
            Integer h = strataIndex.get(strata[i]);
            if (h == null) {
                h = strataIndex.size();
                strataIndex.put(strata[i], h);
            }
            PsuKey key = new PsuKey(h, psus[i]);
            Integer k = psuIndex.get(key);
            if (k == null) {
                k = psuIndex.size();
                psuIndex.put(key, k);
                psuStratum[k] = h;
            }
            s[i] = h;
            c[i] = k;
        }
        int[] perStratum = new int[strataIndex.size()];
        int[] trimmed = Arrays.copyOf(psuStratum, psuIndex.size());
        for (int h : trimmed) {
            perStratum[h]++;
        }
        return new SurveyDesign(weights.clone(), s, c, trimmed, perStratum);
    }

    private record PsuKey(int stratum, long psu) {
    }

    private static long[] ownPsus(int n) {
        long[] ids = new long[n];
        for (int i = 0; i < n; i++) {
            ids[i] = i;
        }
        return ids;
    }

    private static void checkWeights(double[] weights) {
        if (weights == null) {
            throw new IllegalArgumentException("weights must not be null");
        }
        if (weights.length < 2) {
            throw new IllegalArgumentException("weights must hold at least 2 respondents, has " + weights.length);
        }
        for (int i = 0; i < weights.length; i++) {
            if (!(weights[i] > 0) || Double.isInfinite(weights[i])) {
                throw new IllegalArgumentException("weights[" + i + "] must be finite and > 0, was " + weights[i]);
            }
        }
    }

    private static void checkLength(String name, long[] ids, int n) {
        if (ids == null) {
            throw new IllegalArgumentException(name + " must not be null");
        }
        if (ids.length != n) {
            throw new IllegalArgumentException(name + " has " + ids.length + " entries, weights has " + n);
        }
    }

    static void checkValues(String name, int length, SurveyDesign design) {
        if (design == null) {
            throw new IllegalArgumentException(name + " design must not be null");
        }
        if (length != design.size()) {
            throw new IllegalArgumentException(name + " has " + length + " values, its design has "
                    + design.size() + " respondents");
        }
    }

    /** Number of respondents. */
    public int size() {
        return weights.length;
    }

    /** Number of strata. */
    public int strataCount() {
        return psusInStratum.length;
    }

    /** Number of PSUs over all strata. */
    public int psuCount() {
        return psuStratum.length;
    }

    /**
     * Design degrees of freedom, #PSU - #strata (Korn, E. L. and Graubard, B. I. (1999), Analysis of Health
     * Surveys, Wiley; R's {@code degf()}).
     */
    public int degreesOfFreedom() {
        return psuCount() - strataCount();
    }

    /** A copy of the weights. */
    public double[] weights() {
        return weights.clone();
    }

    double weight(int i) {
        return weights[i];
    }

    int stratumOf(int i) {
        return stratumOf[i];
    }

    int psuOf(int i) {
        return psuOf[i];
    }

    int psuStratum(int psu) {
        return psuStratum[psu];
    }

    int psusInStratum(int stratum) {
        return psusInStratum[stratum];
    }
}
