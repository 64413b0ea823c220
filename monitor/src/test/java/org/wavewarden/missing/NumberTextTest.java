package org.wavewarden.missing;

import org.junit.jupiter.api.Test;

import java.math.BigDecimal;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

class NumberTextTest {

    @Test
    void aNumericWrittenOutInFullIsANumberHoweverLong() {
        String minusTenToTheMinus300 = "-0." + "0".repeat(299) + "1";
        assertEquals(0, new BigDecimal("-1e-300").compareTo(NumberText.parse(minusTenToTheMinus300)));
        String longer = "1" + "0".repeat(3_000);
        assertNull(NumberText.parse(longer), "beyond the doubles the nearest double is infinite: not a finite number");
        String manyDecimals = "0." + "0".repeat(2_500) + "5";
        assertEquals(0, BigDecimal.ZERO.compareTo(NumberText.parse(manyDecimals)),
                "far below the doubles the nearest double, zero, stands in");
        assertNull(NumberText.parse("1e5x"));
    }
}
