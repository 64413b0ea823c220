package org.wavewarden.missing;

import org.junit.jupiter.api.Test;
import org.wavewarden.config.CompareWith;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;

/** A variable a codebook declared without a measurement level: its kind comes from the data, the rest stays. */
class VariableInferenceCodebookTest {

    private static final VariableConfig HAS_CAR = new VariableConfig("has_car", null, null, null,
            List.of(new MissingCodeSpec("-9", "Refused")), null, null, List.of(), null, null, "Household has a car",
            Map.of("-9", "Refused"), null);

    private static DatasetConfig dataset(VariableConfig v) {
        return new DatasetConfig("household", "s.t", "wave", null, null, CompareWith.PREVIOUS, null, List.of(),
                List.of(v), null, null, null, null, null, null, null, null, List.of());
    }

    @Test
    void aDeclaredVariableWithoutAKindIsInferredFromItsAnswersLeavingTheDeclaredMissingCodesOut() {
        ColumnTally t = VariableInferenceTest.tally("has_car", ColumnType.INTEGER, Map.of("0", 40L, "1", 55L,
                "-9", 5L));
        List<String> inference = new ArrayList<>();
        List<VariableConfig> vs = VariableInference.variables(dataset(HAS_CAR), List.of(t), inference);
        assertEquals(1, vs.size());
        VariableConfig v = vs.get(0);
        assertEquals(VariableKind.BINARY, v.kind(), "two answers besides the refusal: binary, not a 3-point scale");
        assertEquals("Household has a car", v.label());
        assertEquals(List.of(new MissingCodeSpec("-9", "Refused")), v.missingCodes());
        assertEquals(Map.of("-9", "Refused"), v.valueLabels());
        assertEquals(List.of("has_car: binary (inferred from the data: the codebook declares no measurement level)"),
                inference);
    }

    @Test
    void aLaterReaderOfOneColumnTakesItForWhatTheRunTookItFor() {
        ColumnTally t = VariableInferenceTest.tally("has_car", ColumnType.INTEGER, Map.of("0", 40L, "1", 55L,
                "-9", 5L));
        assertEquals(VariableKind.BINARY, VariableInference.variable(dataset(HAS_CAR), "has_car", t).kind());
    }

    @Test
    void withoutTheColumnInTheWaveItIsScreenedAsText() {
        List<String> inference = new ArrayList<>();
        VariableConfig v = VariableInference.variables(dataset(HAS_CAR), List.of(), inference).get(0);
        assertEquals(VariableKind.TEXT, v.kind());
        assertEquals("Household has a car", v.label());
    }
}
