package org.wavewarden.compare;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

import static org.junit.jupiter.api.Assertions.assertEquals;

/** The Student t the statistics share, held to R 4.2.2's {@code pt} and {@code qt}. */
class StudentTTest {

    @ParameterizedTest(name = "2 * pt(-{0}, {1}) = {2}")
    @CsvSource({
            // R 4.2.2: sprintf("%.15g", 2 * pt(-t, df))
            "2,   10,  0.0733880347707404",
            "1.3, 120, 0.196092477759086",
            "40,  7,   1.59021799848504e-09",
    })
    void twoSidedPMatchesR(double t, double df, double expected) {
        assertEquals(expected, StudentT.twoSidedP(t, df), 1e-12 * Math.max(1, expected / 1e-9));
        assertEquals(expected, StudentT.twoSidedP(-t, df), 1e-12 * Math.max(1, expected / 1e-9));
    }

    @ParameterizedTest(name = "qt((1 + {1}) / 2, {0}) = {2}")
    @CsvSource({
            // R 4.2.2: sprintf("%.15g", qt(0.975, 10)), qt(0.95, 3.5)
            "10,  0.95, 2.22813885198627",
            "3.5, 0.90, 2.2224334936496",
    })
    void twoSidedQuantileMatchesR(double df, double confidence, double expected) {
        assertEquals(expected, StudentT.twoSidedQuantile(df, confidence), 1e-9);
    }
}
