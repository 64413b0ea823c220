package org.wavewarden.compare.proportion;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

import static org.junit.jupiter.api.Assertions.assertEquals;

/** Newcombe's hybrid score interval for a difference of two proportions, from the two Wilson intervals. */
class NewcombeDifferenceTest {

    /*
     * Reference values from R 4.2.2 (no Debian package carries Newcombe's interval): the Wilson limits are
     * prop.test(x, n, correct = FALSE)$conf.int (stats), combined by Newcombe's (1998) method 10:
     *   nc <- function(x1, n1, x2, n2) { w1 <- prop.test(x1, n1, correct = FALSE)$conf.int
     *     w2 <- prop.test(x2, n2, correct = FALSE)$conf.int; p1 <- x1 / n1; p2 <- x2 / n2
     *     c(p1 - p2 - sqrt((p1 - w1[1])^2 + (w2[2] - p2)^2), p1 - p2 + sqrt((w1[2] - p1)^2 + (p2 - w2[1])^2)) }
     * called as nc(current, baseline) and printed with sprintf("%.15g"); the rows give the baseline first.
     */
    @ParameterizedTest(name = "{2}/{3} - {0}/{1}")
    @CsvSource({
            "221, 4200, 168, 3800, -0.0178151539879021, 0.00105113280611699, true",
            "230, 4200, 168, 3800, -0.0200543792621802, -0.0010040164135172, false",
            "190, 2500, 235, 2500, 0.0025309318847172,  0.0335162247182295,  false",
            "1, 40, 5, 40,   -0.0254358235402554, 0.237667119940614,   true",
            "0, 40, 5, 40,   0.0125971145031404,  0.261121198388511,   false",
            "13, 40, 5, 40,   -0.37007904625717,   -0.0157625468750037, false",
            "50, 1000, 10, 100, 0.00268252691864197, 0.125306986939648,   false",
    })
    void matchesNewcombesMethodTenComputedInR(long xBaseline, long nBaseline, long xCurrent, long nCurrent,
                                              double low, double high, boolean zero) {
        NewcombeDifference d = NewcombeDifference.of(xBaseline, nBaseline, xCurrent, nCurrent, 0.95);
        assertEquals(low, d.lower(), 1e-12);
        assertEquals(high, d.upper(), 1e-12);
        assertEquals(zero, d.containsZero());
    }
}
