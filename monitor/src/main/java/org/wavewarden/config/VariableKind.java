package org.wavewarden.config;

import java.util.Locale;

/** How a variable's answers are compared between waves. */
public enum VariableKind {
    /** Measured quantities: Welch t or Mann-Whitney, chosen by the shape of the data. */
    CONTINUOUS,
    /** Ordered answers (scales): rank methods only. */
    ORDINAL,
    /** Unordered codes: chi-square of homogeneity. */
    CATEGORICAL,
    /** Two outcomes: the two-proportion test. */
    BINARY,
    /** Free text: screened for disguised missing values, not compared as a distribution. */
    TEXT,
    /** Calendar dates: screened for sentinel dates, then compared as distributions of dates (KS distance). */
    DATE;

    public String configName() {
        return name().toLowerCase(Locale.ROOT);
    }

    public boolean isNumericScale() {
        return this == CONTINUOUS || this == ORDINAL;
    }
}
