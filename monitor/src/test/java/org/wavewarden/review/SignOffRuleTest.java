package org.wavewarden.review;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

import java.time.Instant;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Which of a wave's alerts stand in the way of its sign-off. */
class SignOffRuleTest {

    static AlertView alert(long id, String variable, String kind, String verdict, AlertState state) {
        return new AlertView(id, 1, "harrowmere", "2024", "2023", variable, kind, verdict, "sentence", List.of(),
                Instant.parse("2026-01-05T09:00:00Z"), state, null);
    }

    @ParameterizedTest(name = "a {0} alert that is {1} blocks the sign-off: {2}")
    @CsvSource(nullValues = "null", value = {
            // verdict,  state,      blocks
            "MATERIAL,   OPEN,       true",
            "MATERIAL,   EXPLAINED,  false",
            "MATERIAL,   MUTED,      false",
            "MATERIAL,   SUPERSEDED, false",
            "UNCERTAIN,  OPEN,       false",
            "null,       OPEN,       false",
    })
    void onlyAnOpenMaterialAlertBlocks(String verdict, AlertState state, boolean blocks) {
        AlertView a = alert(7, "household_size", "SHIFT", verdict, state);
        assertEquals(blocks ? List.of(a) : List.of(), SignOffRule.blocking(List.of(a)));
    }

    @Test
    void theRefusalNamesEveryBlockingAlertByIdVariableAndKind() {
        List<AlertView> wave = List.of(
                alert(11, "tenure", "SHIFT", "MATERIAL", AlertState.OPEN),
                alert(12, "mooring_fee", "SHIFT", "UNCERTAIN", AlertState.OPEN),
                alert(13, "rent", "PANEL_SHIFT", "MATERIAL", AlertState.EXPLAINED),
                alert(14, "commute_minutes", "SHAPE_CHANGE", "MATERIAL", AlertState.OPEN));
        List<AlertView> blocking = SignOffRule.blocking(wave);
        assertEquals(List.of(11L, 14L), blocking.stream().map(AlertView::alertId).toList());
        String why = SignOffRule.refusal("harrowmere", "2024", blocking);
        assertEquals("Wave 2024 of harrowmere cannot be signed off: 2 MATERIAL alerts are open (alert 11, tenure,"
                + " SHIFT; alert 14, commute_minutes, SHAPE_CHANGE). Explain or mute them, or force the sign-off"
                + " with a reason.", why);
        assertTrue(SignOffRule.refusal("harrowmere", "2024", blocking.subList(0, 1))
                .contains("1 MATERIAL alert is open (alert 11, tenure, SHIFT). Explain or mute it,"));
    }
}
