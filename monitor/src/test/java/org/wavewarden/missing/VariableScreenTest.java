package org.wavewarden.missing;

import org.junit.jupiter.api.Test;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.RangeSpec;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.profile.NumericDistribution;

import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** What reaches the comparison: valid answers only, every missing answer counted by its reason. */
class VariableScreenTest {

    static VariableConfig income(List<MissingCodeSpec> codes, RangeSpec range) {
        return new VariableConfig("income", VariableKind.CONTINUOUS, "EUR", range, codes, null, null, List.of(), null);
    }

    @Test
    void aCodebookCodeIsNeverAValidValue() {
        Map<String, Long> values = new HashMap<>();
        values.put("-9", 40L);
        values.put("-8", 10L);
        for (int v = 1000; v < 1100; v++) {
            values.put(String.valueOf(v), 5L);
        }
        ColumnTally t = new ColumnTally("income", ColumnType.INTEGER, 560, 10, values, false);
        ScreenedVariable s = VariableScreen.screen(t, income(List.of(new MissingCodeSpec("-9", "refused"),
                new MissingCodeSpec("-8", "don't know")), null));
        assertEquals(500, s.numeric().n());
        assertTrue(s.numeric().value(0) >= 1000, "smallest valid value " + s.numeric().value(0));
        assertEquals(40L, s.missingByReason().get("refused"));
        assertEquals(10L, s.missingByReason().get("don't know"));
    }

    @Test
    void noMissingCodeReachesTheComparisonOnRandomTallies() {
        // Property: whatever the codes and the counts, the valid distribution holds no coded value and the counts add up.
        SplittableRandom r = new SplittableRandom(11);
        for (int k = 0; k < 200; k++) {
            Map<String, Long> values = new HashMap<>();
            int distinct = 3 + r.nextInt(30);
            for (int i = 0; i < distinct; i++) {
                values.merge(String.valueOf(r.nextInt(100) - 10), 1L + r.nextInt(50), Long::sum);
            }
            List<String> keys = List.copyOf(values.keySet());
            String code = keys.get(r.nextInt(keys.size()));
            long rows = values.values().stream().mapToLong(Long::longValue).sum();
            ColumnTally t = new ColumnTally("x", ColumnType.INTEGER, rows, 0, values, false);
            ScreenedVariable s = VariableScreen.screen(t, income(List.of(new MissingCodeSpec(code, "coded")), null));
            NumericDistribution d = s.numeric();
            for (int i = 0; i < d.size(); i++) {
                assertFalse(d.value(i) == Double.parseDouble(code), "code " + code + " counted as valid");
            }
            long missing = s.missingByReason().values().stream().mapToLong(Long::longValue).sum();
            long invalid = s.invalid().values().stream().mapToLong(Long::longValue).sum();
            assertEquals(rows, d.n() + missing + invalid);
        }
    }

    @Test
    void valuesOutsideTheDeclaredRangeAreLeftOutAndCounted() {
        Map<String, Long> values = Map.of("15", 3L, "20", 50L, "30", 60L, "120", 2L);
        ColumnTally t = new ColumnTally("age", ColumnType.INTEGER, 115, 0, values, false);
        ScreenedVariable s = VariableScreen.screen(t, income(List.of(), new RangeSpec(16.0, 99.0)));
        assertEquals(110, s.numeric().n());
        assertEquals(5L, s.missingByReason().get("outside the declared range"));
    }

    @Test
    void plainDecimalNotationIsRecognisedAsTheRegularExpressionWouldBe() {
        java.util.regex.Pattern reference = java.util.regex.Pattern.compile("[-+]?(\\d+\\.?\\d*|\\.\\d+)([eE][-+]?\\d+)?");
        List<String> cases = List.of("0", "-1", "+2", "3.", ".5", "-.5", "1.25", "1e5", "1E-5", "2.5e+10", "", "-", ".",
                "e5", "1e", "1e+", "1.2.3", "NaN", "Infinity", "0x1p3", "1.5d", " 1", "1 ", "١٢", "12a", "--1", "1e5.5");
        for (String c : cases) {
            assertEquals(reference.matcher(c).matches(), org.wavewarden.missing.NumberText.isPlainDecimal(c), "'" + c + "'");
        }
        SplittableRandom r = new SplittableRandom(3);
        String alphabet = "0123456789.-+eEx ";
        for (int k = 0; k < 20_000; k++) {
            StringBuilder sb = new StringBuilder();
            for (int j = r.nextInt(7); j > 0; j--) {
                sb.append(alphabet.charAt(r.nextInt(alphabet.length())));
            }
            String c = sb.toString();
            assertEquals(reference.matcher(c).matches(), org.wavewarden.missing.NumberText.isPlainDecimal(c), "'" + c + "'");
        }
    }

    @Test
    void textInANumericVariableIsInvalidNotParsed() {
        Map<String, Long> values = new HashMap<>(Map.of("12", 30L, "13", 31L, "twelve", 2L, "NaN", 1L, "0x1p3", 1L,
                "1.5d", 1L));
        for (int v = 1; v < 12; v++) {
            values.put(String.valueOf(v), 20L);
        }
        ColumnTally t = new ColumnTally("n", ColumnType.TEXT, 286, 0, values, false);
        ScreenedVariable s = VariableScreen.screen(t, income(List.of(), null));
        for (String text : List.of("twelve", "0x1p3", "1.5d")) {
            assertTrue(s.invalid().containsKey(text), text + " should be invalid: " + s.invalid());
        }
        // "NaN" is either invalid or recognised as a disguised missing value; it is never a number here.
        assertTrue(s.invalid().containsKey("NaN") || s.excludedValues().contains("NaN"));
        long invalid = s.invalid().values().stream().mapToLong(Long::longValue).sum();
        assertEquals(286, s.numeric().n() + invalid + s.missingByReason().values().stream().mapToLong(Long::longValue)
                .sum());
    }

    @Test
    void theWeightedViewHoldsTheValidAnswersWithTheirWeightsOnly() {
        Map<String, Long> values = new HashMap<>(Map.of("-9", 40L, "1", 10L, "1.0", 5L, "150", 2L));
        Map<String, double[]> weights = new HashMap<>();
        weights.put("-9", new double[] {80, 160});
        weights.put("1", new double[] {20, 45});
        weights.put("1.0", new double[] {5, 5});
        weights.put("150", new double[] {2, 2});
        for (int v = 2; v < 40; v++) {
            values.put(String.valueOf(v), 3L);
            weights.put(String.valueOf(v), new double[] {3 * v, 3 * v * v});
        }
        ColumnTally t = new ColumnTally("income", ColumnType.DECIMAL, 171, 0, values, false);
        VariableConfig v = income(List.of(new MissingCodeSpec("-9", "refused")), new RangeSpec(0.0, 100.0));
        ScreenedVariable s = VariableScreen.screen(t, v, weights);
        var w = s.weighted();
        // the same values as the unweighted distribution: -9 (a code) and 150 (out of range) are gone, "1" and
        // "1.0" are one value
        assertEquals(s.numeric().n(), w.n());
        assertEquals(s.numeric().size(), w.size());
        assertEquals(1.0, w.values()[0]);
        assertEquals(15L, w.counts()[0]);
        assertEquals(25.0, w.weights()[0]);
        assertEquals(50.0, w.squaredWeights()[0]);
        double total = 25;
        for (int x = 2; x < 40; x++) {
            total += 3 * x;
        }
        assertEquals(total, w.totalWeight(), 1e-9);
        assertEquals(null, VariableScreen.screen(t, v).weighted(), "no weights, no weighted view");
        assertEquals(s.numeric(), VariableScreen.screen(t, v).numeric(), "weights change nothing unweighted");
    }
}
