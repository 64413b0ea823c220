package org.wavewarden.deliver.sink;

import org.junit.jupiter.api.Test;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;

import java.util.List;
import java.util.Set;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

class SinkFilterTest {

    @Test
    void minimumVerdictLetsThroughItselfAndEverythingMoreUrgent() {
        SinkFilter f = new SinkFilter(Verdict.MINOR, Set.of());
        assertTrue(f.accepts(FindingKind.SHIFT, Verdict.MATERIAL));
        assertTrue(f.accepts(FindingKind.SHIFT, Verdict.MINOR));
        assertFalse(f.accepts(FindingKind.SHIFT, Verdict.UNCERTAIN));
        assertFalse(f.accepts(FindingKind.SHIFT, Verdict.STABLE));
        assertTrue(f.accepts(FindingKind.MISSING_RATE_CHANGE, Verdict.MATERIAL));
        assertFalse(f.accepts(FindingKind.MISSING_RATE_CHANGE, Verdict.STABLE));
    }

    @Test
    void everyVerdictAgainstEveryMinimumFollowsTheVerdictOrder() {
        for (Verdict min : Verdict.values()) {
            SinkFilter f = new SinkFilter(min, Set.of(FindingKind.BLANK));
            for (Verdict v : Verdict.values()) {
                assertEquals(v.ordinal() <= min.ordinal(), f.accepts(FindingKind.SHIFT, v), min + " / " + v);
            }
        }
    }

    @Test
    void nullMinimumLetsEveryVerdictThrough() {
        SinkFilter f = new SinkFilter(null, Set.of(FindingKind.BLANK));
        for (Verdict v : Verdict.values()) {
            assertTrue(f.accepts(FindingKind.SHIFT, v));
        }
    }

    @Test
    void emptyKindsMeansEveryDataQualityKindButNotSkippedOrShape() {
        SinkFilter f = new SinkFilter(Verdict.MATERIAL, Set.of());
        for (FindingKind k : FindingKind.values()) {
            assertEquals(k.isDataQuality(), f.accepts(k, null), k.name());
        }
    }

    @Test
    void listedKindsAreTheOnlyOnesWithoutAVerdictThatPass() {
        SinkFilter f = new SinkFilter(Verdict.MATERIAL, Set.of(FindingKind.BLANK, FindingKind.SKIPPED));
        assertTrue(f.accepts(FindingKind.BLANK, null));
        assertTrue(f.accepts(FindingKind.SKIPPED, null));
        assertFalse(f.accepts(FindingKind.PLACEHOLDER, null));
        // The kinds list does not govern findings that carry a verdict.
        assertTrue(f.accepts(FindingKind.SHIFT, Verdict.MATERIAL));
    }

    @Test
    void acceptsAMessageByItsKindAndVerdict() {
        SinkFilter f = new SinkFilter(Verdict.MATERIAL, Set.of(FindingKind.BLANK));
        List<AlertMessage> batch = Messages.batch();
        assertEquals(List.of(true, false, false), batch.stream().map(f::accepts).toList());
    }

    @Test
    void parsesConfigurationTextInAnyCase() {
        SinkFilter f = SinkFilter.of("uncertain", List.of("blank", "code-appeared"));
        assertEquals(new SinkFilter(Verdict.UNCERTAIN, Set.of(FindingKind.BLANK, FindingKind.CODE_APPEARED)), f);
        assertEquals(SinkFilter.all(), SinkFilter.of(null, null));
    }

    @Test
    void unknownNamesAreRefusedNamingTheArgumentAndTheChoices() {
        IllegalArgumentException v = assertThrows(IllegalArgumentException.class,
                () -> SinkFilter.of("SEVERE", List.of()));
        assertTrue(v.getMessage().startsWith("minimumVerdict:") && v.getMessage().contains("MATERIAL")
                && v.getMessage().contains("'SEVERE'"), v.getMessage());
        IllegalArgumentException k = assertThrows(IllegalArgumentException.class,
                () -> SinkFilter.of(null, List.of("BLANK", "blurry")));
        assertTrue(k.getMessage().startsWith("kinds:") && k.getMessage().contains("'blurry'"), k.getMessage());
    }

    @Test
    void anEventPassesWhenAnyOfItsFindingsPasses() {
        SinkFilter materialOnly = new SinkFilter(Verdict.MATERIAL, Set.of(FindingKind.NUMERIC_SENTINEL));
        AlertMessage uncertainWithSentinel = AlertMessage.of("survey", "w2", "w1", 7L, "abc123",
                new org.wavewarden.deliver.Alert(List.of(Messages.shift("height", Verdict.UNCERTAIN),
                        Messages.quality("height", FindingKind.NUMERIC_SENTINEL))));
        AlertMessage uncertainWithBlank = AlertMessage.of("survey", "w2", "w1", 7L, "abc123",
                new org.wavewarden.deliver.Alert(List.of(Messages.shift("height", Verdict.UNCERTAIN),
                        Messages.quality("height", FindingKind.BLANK))));
        assertTrue(materialOnly.accepts(uncertainWithSentinel));
        assertFalse(materialOnly.accepts(uncertainWithBlank));
        assertTrue(materialOnly.acceptsAny(List.of(new SinkFilter.Judged(FindingKind.SHIFT, Verdict.STABLE),
                new SinkFilter.Judged(FindingKind.PANEL_SHIFT, Verdict.MATERIAL))));
        assertFalse(materialOnly.acceptsAny(List.of()));
    }
}
