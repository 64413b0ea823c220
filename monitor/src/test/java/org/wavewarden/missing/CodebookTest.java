package org.wavewarden.missing;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Random;
import java.util.TreeMap;
import org.junit.jupiter.api.Test;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.profile.NumericDistribution;

class CodebookTest {

    // Common survey practice (CHECK-SOURCES: no single source): 7/77/777 refused, 9/99/999 don't know.
    static final Codebook BOOK = Codebook.of(new MissingCode("999", "don't know"), new MissingCode("777", "refused"),
            new MissingCode("-1", "not applicable"), new MissingCode("NA", "not asked"), new MissingCode("", "blank"));

    @Test
    void numericCodesMatchEveryDecimalSpellingInNumericColumns() {
        for (String raw : List.of("999", "999.0", "999.00", " 999 ", "+999")) {
            assertEquals(Optional.of("don't know"), BOOK.reasonOf(raw, ColumnType.DECIMAL), raw);
        }
        assertEquals(Optional.of("not applicable"), BOOK.reasonOf("-1.000", ColumnType.INTEGER));
        assertEquals(Optional.empty(), BOOK.reasonOf("9990", ColumnType.DECIMAL));
        assertEquals(Optional.empty(), BOOK.reasonOf("99.9", ColumnType.DECIMAL));
    }

    @Test
    void textCodesMatchExactlyOrAfterTrimmingButNotNumerically() {
        assertEquals(Optional.of("not asked"), BOOK.reasonOf("NA", ColumnType.TEXT));
        assertEquals(Optional.of("not asked"), BOOK.reasonOf("  NA ", ColumnType.TEXT));
        assertEquals(Optional.of("blank"), BOOK.reasonOf("   ", ColumnType.TEXT));
        assertEquals(Optional.empty(), BOOK.reasonOf("na", ColumnType.TEXT));
        assertEquals(Optional.of("don't know"), BOOK.reasonOf("999", ColumnType.TEXT));
        assertEquals(Optional.empty(), BOOK.reasonOf("999.0", ColumnType.TEXT), "text keeps its decimals");
        assertEquals(Optional.empty(), Codebook.of(new MissingCode("7", "refused")).reasonOf("007", ColumnType.TEXT));
        assertEquals(Optional.of("refused"), Codebook.of(new MissingCode("7", "refused")).reasonOf("007"));
    }

    @Test
    void aCodebookRejectsTheSameCodeTwice() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> Codebook.of(
                new MissingCode("99", "a"), new MissingCode("99.0", "b")));
        assertTrue(e.getMessage().contains("99"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> Codebook.of(new MissingCode("x", "a"), new MissingCode(" x", "b")));
        assertThrows(IllegalArgumentException.class, () -> new MissingCode("9", " "));
    }

    @Test
    void splitCountsByReasonAndKeepsEveryReasonEvenWhenAbsent() {
        Map<String, Long> v = new HashMap<>();
        v.put("1", 40L);
        v.put("2", 30L);
        v.put("999", 5L);
        v.put("999.0", 2L);
        v.put("-1", 3L);
        ColumnTally t = new ColumnTally("q1", ColumnType.DECIMAL, 90, 10, v, false);
        CodebookSplit s = BOOK.split(t);
        assertEquals(List.of("don't know", "refused", "not applicable", "not asked", "blank"),
                List.copyOf(s.countsByReason().keySet()));
        assertEquals(7L, s.countsByReason().get("don't know"));
        assertEquals(0L, s.countsByReason().get("refused"));
        assertEquals(3L, s.countsByReason().get("not applicable"));
        assertEquals(10, s.codedMissingCount());
        assertEquals(Map.of("1", 40L, "2", 30L), s.validOnly().valueCounts());
        assertEquals(70, s.validOnly().nonNullCount());
        assertEquals(10, s.validOnly().nullCount());
    }

    @Test
    void aMissingCodeIsNeverCountedAsAValidValue() {
        Random rnd = new Random(3);
        String[] codes = {"999", "999.0", "777", "-1", "-1.00"};
        for (int rep = 0; rep < 200; rep++) {
            Map<String, Long> v = new HashMap<>();
            for (int i = 0; i < 1 + rnd.nextInt(30); i++) {
                v.merge(Integer.toString(rnd.nextInt(120) - 5), 1L + rnd.nextInt(50), Long::sum);
            }
            for (String c : codes) {
                if (rnd.nextBoolean()) {
                    v.put(c, 1L + rnd.nextInt(20));
                }
            }
            long nulls = rnd.nextInt(10);
            long nonNull = v.values().stream().mapToLong(Long::longValue).sum();
            ColumnTally t = new ColumnTally("x", ColumnType.INTEGER, nonNull + nulls, nulls, v, false);
            CodebookSplit s = BOOK.split(t);
            TreeMap<Double, Long> valid = new TreeMap<>();
            s.validOnly().valueCounts().forEach((k, c) -> valid.merge(Double.parseDouble(k), c, Long::sum));
            NumericDistribution d = NumericDistribution.ofTally(valid);
            for (int i = 0; i < d.size(); i++) {
                assertFalse(d.value(i) == 999 || d.value(i) == 777 || d.value(i) == -1, "code in the valid values");
                assertTrue(BOOK.reasonOf(NumberText.plain(d.value(i))).isEmpty());
            }
            assertEquals(nonNull, s.validOnly().nonNullCount() + s.codedMissingCount());
            assertEquals(d.n(), s.validOnly().nonNullCount());
            // The split is idempotent: nothing left to take out.
            assertEquals(0, BOOK.split(s.validOnly()).codedMissingCount());
        }
    }
}
