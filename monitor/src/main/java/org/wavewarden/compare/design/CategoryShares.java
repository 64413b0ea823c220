package org.wavewarden.compare.design;

import java.util.Arrays;

/**
 * Weighted shares of the categories of one variable with their design-based covariance matrix (Taylor
 * linearisation; Wolter, K. M. (2007), Introduction to Variance Estimation, 2nd ed., Springer, Chapter 6).
 *
 * @param codes      the observed category codes, ascending
 * @param shares     {@code shares[j]}: weighted share of {@code codes[j]}; they sum to 1
 * @param estimates  the same shares with standard errors and design effects
 * @param covariance design-based covariance of the shares, {@code codes.length} square
 */
public record CategoryShares(int[] codes, double[] shares, DesignEstimate[] estimates, double[][] covariance) {

    public CategoryShares {
        codes = codes.clone();
        shares = shares.clone();
        estimates = estimates.clone();
        covariance = deepCopy(covariance);
    }

    @Override
    public int[] codes() {
        return codes.clone();
    }

    @Override
    public double[] shares() {
        return shares.clone();
    }

    @Override
    public DesignEstimate[] estimates() {
        return estimates.clone();
    }

    @Override
    public double[][] covariance() {
        return deepCopy(covariance);
    }

    /** The estimate for one category code. */
    public DesignEstimate of(int code) {
        int j = Arrays.binarySearch(codes, code);
        if (j < 0) {
            throw new IllegalArgumentException("code " + code + " was not observed; codes are "
                    + Arrays.toString(codes));
        }
        return estimates[j];
    }

    private static double[][] deepCopy(double[][] m) {
        double[][] copy = new double[m.length][];
        for (int i = 0; i < m.length; i++) {
            copy[i] = m[i].clone();
        }
        return copy;
    }
}
