package org.wavewarden.missing;

import org.junit.jupiter.api.Test;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;

import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The evidence of a candidate speaks in the terms of its column and names the denominator of its share. */
class EvidenceWordingTest {

    @Test
    void aSentinelDateIsDescribedInTimeBeforeTheOtherDatesNotInQuartilesOrSigns() {
        Random rnd = new Random(5);
        Map<String, Long> dates = new HashMap<>();
        for (int i = 0; i < 3000; i++) {
            dates.merge(java.time.LocalDate.of(1975, 1, 1).plusDays(rnd.nextInt(18000)).toString(), 1L, Long::sum);
        }
        dates.put("1900-01-01", 40L);
        long rows = dates.values().stream().mapToLong(Long::longValue).sum();
        List<MissingCandidate> got = DisguisedMissingDetector.detect(new ColumnTally("moved_in", ColumnType.DATE,
                rows, 0, dates, false), Optional.empty());
        MissingCandidate c = got.stream().filter(x -> x.value().equals("1900-01-01")).findFirst().orElseThrow();
        assertEquals(CandidateKind.SENTINEL_DATE, c.kind());
        String e = c.evidence();
        assertFalse(e.contains("IQR") || e.contains("negative") || e.contains("quartile of the other values"), e);
        assertTrue(e.contains("years before the earliest other date"), e);
        assertTrue(e.contains("before the earliest quarter of the other dates"), e);
    }

    @Test
    void aShareInTheEvidenceNamesTheNonNullAnswersAsItsDenominator() {
        Map<String, Long> values = new HashMap<>(Map.of("", 12L, "north", 100L, "south", 100L, "east", 88L));
        List<MissingCandidate> got = DisguisedMissingDetector.detect(new ColumnTally("region", ColumnType.TEXT, 480,
                180, values, false), Optional.empty());
        // 12 of the 300 non-null answers are blank: 4.0%.
        assertTrue(got.get(0).evidence().contains("occurs 12 times (4.0% of the non-null answers)"),
                got.get(0).evidence());
    }
}
