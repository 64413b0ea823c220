package org.wavewarden.missing;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Collections;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Random;
import java.util.Set;
import java.util.stream.Collectors;
import org.junit.jupiter.api.Test;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;

class DisguisedMissingDetectorTest {

    static ColumnTally tally(ColumnType type, Map<String, Long> counts) {
        long n = counts.values().stream().mapToLong(Long::longValue).sum();
        return new ColumnTally("c", type, n, 0, counts, false);
    }

    static List<MissingCandidate> detect(ColumnType type, Map<String, Long> counts) {
        return DisguisedMissingDetector.detect(tally(type, counts), Optional.empty());
    }

    static Set<String> values(List<MissingCandidate> c) {
        return c.stream().map(MissingCandidate::value).collect(Collectors.toSet());
    }

    static Map<String, Long> scale(int lo, int hi, long each) {
        Map<String, Long> m = new LinkedHashMap<>();
        for (int v = lo; v <= hi; v++) {
            m.put(Integer.toString(v), each + 7L * (v % 3));
        }
        return m;
    }

    @Test
    void blanksInvisiblesAndPlaceholdersInManySpellingsAreFound() {
        Map<String, Long> m = new LinkedHashMap<>();
        m.put("red", 300L);
        m.put("green", 250L);
        m.put("blue", 200L);
        List<String> blanks = List.of("", "  ", "\t");
        List<String> invisible = List.of("\u00A0", "\u200B", "\u200C", "\u200D", "\uFEFF", " \u2003 ");
        List<String> placeholders = List.of("N/A", "n/a", "n.a.", "NA", "na", "null", "NULL", "None", "nil", "-", "--",
                "?", "Unknown", "REFUSED", "don't know", "Don\u2019t Know", "dont know", "DON'T-KNOW", "not stated",
                "Not  Stated", "missing", "x", ".", "#N/A", " n / a ");
        blanks.forEach(b -> m.put(b, 5L));
        invisible.forEach(b -> m.put(b, 4L));
        placeholders.forEach(b -> m.put(b, 3L));
        List<MissingCandidate> got = detect(ColumnType.TEXT, m);
        Map<String, CandidateKind> kind = got.stream().collect(Collectors.toMap(MissingCandidate::value,
                MissingCandidate::kind));
        blanks.forEach(b -> assertEquals(CandidateKind.BLANK, kind.get(b), "'" + b + "'"));
        invisible.forEach(b -> assertEquals(CandidateKind.INVISIBLE, kind.get(b), DisguisedMissingDetector.visible(b)));
        placeholders.forEach(b -> assertEquals(CandidateKind.PLACEHOLDER, kind.get(b), b));
        assertEquals(blanks.size() + invisible.size() + placeholders.size(), got.size(), "red, green, blue are answers");
        MissingCandidate nbsp = got.stream().filter(c -> c.value().equals("\u00A0")).findFirst().orElseThrow();
        assertTrue(nbsp.evidence().contains("\\u00A0"), nbsp.evidence());
    }

    @Test
    void twoCodesXAndYHalfEachAreAnswersNotPlaceholders() {
        List<MissingCandidate> got = detect(ColumnType.TEXT, Map.of("x", 50L, "y", 50L));
        assertEquals(List.of(), got, "'x' is one of the column's two codes");
    }

    @Test
    void aWeakTokenHoldingALargeShareOfFreeTextIsAnAnswer() {
        Map<String, Long> m = freeText(60, 2);
        m.put("none", 40L); // 40 of 160 answers: a quarter of the column answers 'none'
        List<MissingCandidate> got = detect(ColumnType.TEXT, m);
        assertTrue(got.stream().noneMatch(c -> c.kind() == CandidateKind.PLACEHOLDER), got.toString());
    }

    @Test
    void aWeakTokenThatIsARareValueOfFreeTextIsStillAPlaceholder() {
        Map<String, Long> m = freeText(60, 2);
        m.put("xxx", 6L);
        List<MissingCandidate> got = detect(ColumnType.TEXT, m);
        assertEquals(Set.of("xxx"), values(got.stream().filter(c -> c.kind() == CandidateKind.PLACEHOLDER).toList()));
    }

    @Test
    void notApplicableAmongManyFreeTextAnswersIsStillAPlaceholder() {
        Map<String, Long> m = freeText(60, 2);
        m.put("n/a", 6L);
        List<MissingCandidate> got = detect(ColumnType.TEXT, m);
        assertEquals(Set.of("n/a"), values(got.stream().filter(c -> c.kind() == CandidateKind.PLACEHOLDER).toList()));
    }

    @Test
    void knownNoAnswerFormsArePlaceholdersEvenAsOneOfFewCodesOrAHalfOfTheColumn() {
        List<MissingCandidate> got = detect(ColumnType.TEXT, Map.of("yes", 40L, "no", 30L, ".", 20L, "n/a", 10L));
        assertEquals(Set.of(".", "n/a"), values(got.stream().filter(c -> c.kind() == CandidateKind.PLACEHOLDER)
                .toList()));
        List<MissingCandidate> half = detect(ColumnType.TEXT, Map.of("red", 50L, "Don't know", 50L));
        assertEquals(Set.of("Don't know"), values(half));
    }

    /** Free-text answers "answer 1" .. "answer n", each given {@code each} times. */
    static Map<String, Long> freeText(int n, long each) {
        Map<String, Long> m = new LinkedHashMap<>();
        for (int i = 1; i <= n; i++) {
            m.put("answer " + i, each);
        }
        return m;
    }

    @Test
    void aNineAfterAOneToFiveScaleStandsApartEvenWithoutADeclaredRange() {
        Map<String, Long> m = scale(1, 5, 200);
        m.put("9", 12L);
        List<MissingCandidate> got = detect(ColumnType.INTEGER, m);
        assertEquals(1, got.size(), got.toString());
        assertEquals("9", got.get(0).value());
        assertEquals(CandidateKind.NUMERIC_SENTINEL, got.get(0).kind());
        assertTrue(got.get(0).evidence().contains("above the largest other value"), got.get(0).evidence());
    }

    @Test
    void genuineScalesAgesCountsAndRoundIncomesGiveNoCandidates() {
        Random rnd = new Random(17);
        assertEquals(List.of(), detect(ColumnType.INTEGER, scale(1, 5, 300)));
        assertEquals(List.of(), detect(ColumnType.INTEGER, scale(0, 10, 120)));
        assertEquals(List.of(), detect(ColumnType.INTEGER, scale(1, 9, 120)), "a 1..9 scale keeps its 7, 8, 9");
        Map<String, Long> ages = new HashMap<>();
        Map<String, Long> counts = new HashMap<>();
        Map<String, Long> incomes = new HashMap<>();
        for (int i = 0; i < 5000; i++) {
            int age = 16 + (int) Math.min(79, Math.abs(rnd.nextGaussian()) * 30 + rnd.nextDouble() * 15);
            ages.merge(Integer.toString(age % 5 != 0 && rnd.nextDouble() < 0.3 ? 5 * Math.round(age / 5f) : age), 1L,
                    Long::sum);
            counts.merge(Integer.toString(rnd.nextDouble() < 0.4 ? 0 : Math.min(20, (int) (rnd.nextDouble() * 9))), 1L,
                    Long::sum);
            long step = rnd.nextDouble() < 0.6 ? 1000 : 100;
            incomes.merge(Long.toString(Math.round(Math.exp(10.3 + 0.7 * rnd.nextGaussian()) / step) * step), 1L,
                    Long::sum);
        }
        assertEquals(List.of(), detect(ColumnType.INTEGER, ages));
        assertEquals(List.of(), detect(ColumnType.INTEGER, counts), "a natural zero spike is no code");
        assertEquals(List.of(), DisguisedMissingDetector.detect(tally(ColumnType.INTEGER, counts),
                Optional.of(ValueRange.between(0, 20))));
        assertEquals(List.of(), detect(ColumnType.INTEGER, incomes), "heaping on round incomes is no code");
        assertEquals(List.of(), detect(ColumnType.TEXT, Map.of("1", 400L, "2", 300L, "3", 200L, "4", 100L)));
    }

    @Test
    void sentinelsPlantedInAgesAreFoundWithEvidenceInWords() {
        Map<String, Long> ages = new HashMap<>();
        for (int a = 16; a <= 95; a++) {
            ages.put(Integer.toString(a), (long) Math.max(3, 120 - Math.abs(a - 40) * 2));
        }
        ages.put("999", 412L);
        ages.put("-9", 30L);
        List<MissingCandidate> got = detect(ColumnType.INTEGER, ages);
        assertEquals(Set.of("999", "-9"), values(got));
        MissingCandidate c999 = got.stream().filter(c -> c.value().equals("999")).findFirst().orElseThrow();
        assertTrue(c999.evidence().startsWith("999 occurs 412 times ("), c999.evidence());
        assertTrue(c999.evidence().contains("IQR above the upper quartile"), c999.evidence());
        assertTrue(c999.evidence().contains("times as often as the median of its nearest neighbouring values"),
                c999.evidence());
        assertTrue(c999.confidence() >= 0.9, c999.toString());
        ages.remove("999");
        ages.remove("-9");
        ages.put("99", 60L);
        assertEquals(Set.of("99"), values(detect(ColumnType.INTEGER, ages)), "99 after ages ending at 95");
    }

    @Test
    void zeroIsACandidateOnlyWhenTheDeclaredRangeExcludesIt() {
        Map<String, Long> m = scale(1, 5, 200);
        m.put("0", 40L);
        ColumnTally t = tally(ColumnType.INTEGER, m);
        assertEquals(List.of(), DisguisedMissingDetector.detect(t, Optional.of(ValueRange.between(0, 5))));
        List<MissingCandidate> got = DisguisedMissingDetector.detect(t, Optional.of(ValueRange.between(1, 5)));
        assertEquals(1, got.size());
        assertEquals(CandidateKind.OUT_OF_RANGE_SENTINEL, got.get(0).kind());
        assertTrue(got.get(0).evidence().contains("below the declared range [1, 5]"), got.get(0).evidence());
    }

    @Test
    void equalNumbersWrittenDifferentlyAreOnePoint() {
        Map<String, Long> m = new HashMap<>();
        for (int v = 1; v <= 5; v++) {
            m.put(v + ".00", 200L);
        }
        m.put("999.00", 10L);
        m.put("999.0", 3L);
        List<MissingCandidate> got = detect(ColumnType.DECIMAL, m);
        assertEquals(1, got.size(), got.toString());
        assertEquals("999.00", got.get(0).value());
        assertEquals(13, got.get(0).count());
    }

    @Test
    void sentinelDatesAreFoundInDatesAndTimestamps() {
        Random rnd = new Random(2);
        Map<String, Long> dates = new HashMap<>();
        Map<String, Long> stamps = new HashMap<>();
        for (int i = 0; i < 3000; i++) {
            java.time.LocalDate d = java.time.LocalDate.of(1950, 1, 1).plusDays(rnd.nextInt(20000));
            dates.merge(d.toString(), 1L, Long::sum);
            stamps.merge(d + " " + String.format("%02d:%02d:%02d", rnd.nextInt(24), rnd.nextInt(60), rnd.nextInt(60)),
                    1L, Long::sum);
        }
        assertEquals(List.of(), detect(ColumnType.DATE, dates));
        assertEquals(List.of(), detect(ColumnType.TIMESTAMP, stamps));
        dates.put("1900-01-01", 25L);
        dates.put("9999-12-31", 9L);
        dates.put("2000-01-01", 15L);
        dates.put("infinity", 4L);
        stamps.put("1970-01-01 00:00:00", 30L);
        List<MissingCandidate> got = detect(ColumnType.DATE, dates);
        assertEquals(Set.of("1900-01-01", "9999-12-31", "2000-01-01", "infinity"), values(got));
        assertTrue(got.stream().allMatch(c -> c.kind() == CandidateKind.SENTINEL_DATE));
        assertEquals(Set.of("1970-01-01 00:00:00"), values(detect(ColumnType.TIMESTAMP, stamps)));
    }

    @Test
    void textInANumericLookingTextColumnIsFoundAndItsNumbersAreScanned() {
        Map<String, Long> m = new HashMap<>();
        for (int v = 0; v <= 30; v++) {
            m.put(Integer.toString(v), 40L + v);
        }
        m.put("ten", 4L);
        m.put("n/a", 6L);
        m.put("999", 20L);
        List<MissingCandidate> got = detect(ColumnType.TEXT, m);
        Map<String, CandidateKind> kind = got.stream().collect(Collectors.toMap(MissingCandidate::value,
                MissingCandidate::kind));
        assertEquals(Map.of("ten", CandidateKind.TEXT_IN_NUMERIC, "n/a", CandidateKind.PLACEHOLDER, "999",
                CandidateKind.NUMERIC_SENTINEL), kind);
    }

    @Test
    void digitsAmongNamesAreShapeOutliersWithLowConfidenceButRareNamesAreNot() {
        Map<String, Long> m = new HashMap<>();
        String[] names = {"Anna Berg", "Ben Ott", "Carl Diaz", "Dora Ek", "Eva Falk", "Finn Gray", "Gil Hart"};
        for (String n : names) {
            m.put(n, 150L);
        }
        m.put("Mary O'Brien", 3L);
        m.put("Jo Smith-Jones", 2L);
        m.put("Cher", 4L);
        m.put("12345", 6L);
        List<MissingCandidate> got = detect(ColumnType.TEXT, m);
        assertEquals(Set.of("12345"), values(got));
        assertEquals(CandidateKind.PATTERN_OUTLIER, got.get(0).kind());
        assertTrue(got.get(0).confidence() <= 0.5);
    }

    @Test
    void anInlierSpikeIsFoundAndHeapedRoundValuesAreNot() {
        Map<String, Long> m = new HashMap<>();
        for (int a = 18; a <= 80; a++) {
            m.put(Integer.toString(a), a % 10 == 0 ? 120L : a % 5 == 0 ? 90L : 50L);
        }
        assertEquals(List.of(), detect(ColumnType.INTEGER, m));
        m.put("37", 600L);
        List<MissingCandidate> got = detect(ColumnType.INTEGER, m);
        assertEquals(1, got.size(), got.toString());
        assertEquals(CandidateKind.INLIER_SPIKE, got.get(0).kind());
        assertEquals("37", got.get(0).value());
    }

    @Test
    void resultsDoNotDependOnTheOrderOfTheTally() {
        Map<String, Long> m = scale(1, 7, 100);
        m.put("99", 20L);
        m.put("", 5L);
        m.put("N/A", 3L);
        List<MissingCandidate> first = detect(ColumnType.TEXT, m);
        List<Map.Entry<String, Long>> entries = new ArrayList<>(m.entrySet());
        Random rnd = new Random(4);
        for (int rep = 0; rep < 20; rep++) {
            Collections.shuffle(entries, rnd);
            Map<String, Long> shuffled = new LinkedHashMap<>();
            entries.forEach(e -> shuffled.put(e.getKey(), e.getValue()));
            assertEquals(first, detect(ColumnType.TEXT, shuffled));
        }
        assertEquals(3, first.size());
    }

    @Test
    void everyCandidateHasShareAndConfidenceInRange() {
        Map<String, Long> m = scale(1, 5, 50);
        m.put("-1", 80L);
        m.put("9", 400L);
        long n = m.values().stream().mapToLong(Long::longValue).sum();
        List<MissingCandidate> got = detect(ColumnType.INTEGER, m);
        assertEquals(Set.of("-1", "9"), values(got));
        for (MissingCandidate c : got) {
            assertTrue(c.share() > 0 && c.share() <= 1 && c.confidence() >= 0 && c.confidence() <= 1, c.toString());
            assertEquals((double) c.count() / n, c.share(), 1e-12);
        }
        assertThrows(IllegalArgumentException.class, () -> DisguisedMissingDetector.detect(null, Optional.empty()));
        assertThrows(IllegalArgumentException.class, () -> new MissingCandidate("x", CandidateKind.BLANK, 1, 1.5, 0.5,
                "e"));
    }
}
