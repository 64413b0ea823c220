package org.wavewarden.compare.proportion;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

/** Wilson's score interval, of counts and of a share at a size that need not be whole. */
class WilsonIntervalTest {

    @ParameterizedTest(name = "{0} of {1} at {2}")
    @CsvSource({
            // R 4.2.2: prop.test(x, n, correct = FALSE, conf.level = c)$conf.int, printed with sprintf("%.15g")
            "3, 10, 0.90, 0.126876583903198, 0.558300204130165",
            "0, 7,  0.95, 0,                 0.354330435066687",
    })
    void countsMatchRsPropTestWithoutContinuityCorrection(long x, long n, double c, double low, double high) {
        WilsonInterval w = WilsonInterval.of(x, n, c);
        assertEquals(low, w.lower(), 1e-12);
        assertEquals(high, w.upper(), 1e-12);
    }

    @Test
    void aShareOfAWholeSizeIsTheIntervalOfItsCounts() {
        assertEquals(WilsonInterval.of(3, 10, 0.9), WilsonInterval.ofShare(0.3, 10, 0.9));
        assertEquals(WilsonInterval.of(7, 7, 0.95), WilsonInterval.ofShare(1, 7, 0.95));
    }

    @Test
    void aShareAtAnEffectiveSizeNarrowsAsTheSizeGrows() {
        WilsonInterval small = WilsonInterval.ofShare(0.2, 12.5, 0.95);
        WilsonInterval large = WilsonInterval.ofShare(0.2, 125.5, 0.95);
        assertEquals(true, large.upper() - large.lower() < small.upper() - small.lower());
        assertThrows(IllegalArgumentException.class, () -> WilsonInterval.ofShare(1.2, 10, 0.95));
        assertThrows(IllegalArgumentException.class, () -> WilsonInterval.ofShare(0.2, 0, 0.95));
    }
}
