package org.wavewarden.compare;

import org.junit.jupiter.api.Test;
import org.wavewarden.profile.NumericDistribution;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

class DateComparisonTest {

    static Map<String, Long> dates(String from, int days, long each) {
        Map<String, Long> m = new LinkedHashMap<>();
        java.time.LocalDate d = java.time.LocalDate.parse(from);
        for (int i = 0; i < days; i++) {
            m.put(d.plusDays(i).toString(), each + i % 3);
        }
        return m;
    }

    @Test
    void excludedValuesAndUnreadableTextAreLeftOutAndTimesOfDayAreFractionsOfADay() {
        Map<String, Long> m = new LinkedHashMap<>();
        m.put("1900-01-01", 5L);
        m.put("infinity", 2L);
        m.put("2020-01-01", 3L);
        m.put("2020-01-02 18:00:00", 1L);
        NumericDistribution d = DateComparison.days(m, List.of("1900-01-01"));
        assertEquals(4, d.n());
        assertEquals(18262.0, d.value(0), 0); // as.numeric(as.Date("2020-01-01")) in R
        assertEquals(18263.75, d.value(1), 0);
    }

    @Test
    void swappingTheWavesKeepsTheDistanceAndFlipsTheMedianShift() {
        VariableComparator comparator = new VariableComparator(0.95);
        Map<String, Long> a = dates("2010-01-01", 400, 4);
        Map<String, Long> b = dates("2010-03-01", 400, 4);
        Comparison ab = DateComparison.compare(comparator, "d", a, List.of(), b, List.of()).orElseThrow();
        Comparison ba = DateComparison.compare(comparator, "d", b, List.of(), a, List.of()).orElseThrow();
        assertEquals(ab.test().statistic(), ba.test().statistic(), 1e-15);
        assertEquals(ab.test().pValue(), ba.test().pValue(), 1e-15);
        double shift = ((DateComparison.DateDetail) ab.detail()).medianShiftDays();
        assertEquals(59, shift, 0); // 2010-01-01 to 2010-03-01
        assertEquals(-shift, ((DateComparison.DateDetail) ba.detail()).medianShiftDays(), 0);
    }

    @Test
    void wavesWhoseDatesCoverDifferentPeriodsAreNotComparedButOverlappingOnesAre() {
        Map<String, Long> q1 = dates("2024-01-01", 91, 10);
        Map<String, Long> q2 = dates("2024-04-01", 91, 10);
        String why = DateComparison.skipReason(q1, List.of(), q2, List.of());
        assertTrue(why.startsWith("the two waves' dates cover different periods (2024-01-01 to 2024-03-31"), why);
        assertTrue(DateComparison.compare(new VariableComparator(0.95), "d", q1, List.of(), q2, List.of()).isEmpty());
        assertNull(DateComparison.skipReason(q1, List.of(), dates("2024-02-01", 91, 10), List.of()));
        assertEquals("fewer than 2 readable dates in a wave (1 and 1000)",
                DateComparison.skipReason(Map.of("2024-01-01", 1L), List.of(), q1, List.of()));
    }
}
