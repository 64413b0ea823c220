package org.wavewarden.deliver.sink;

import org.junit.jupiter.api.Test;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** What a roll-up says: the new alerts grouped by verdict, then data quality by kind; what was not sent, and why. */
class RollUpTest {

    static final String KEY = RollUp.idempotencyKey("survey", "email:relay:587", "roll-up of /out/digest-x");

    static RollUp rollUp(List<AlertMessage> alerts, RollUp.NotSent notSent, String link) {
        return new RollUp("survey", "digest-20261203T011500Z", List.of(7L, 8L), alerts, notSent, link, KEY);
    }

    @Test
    void alertsAreListedMaterialFirstThenUncertainThenDataQualityByKind() {
        List<AlertMessage> given = AlertMessage.ofRun("survey", "w2", "w1", 7L, "abc123", List.of(
                Messages.quality("region", FindingKind.PLACEHOLDER), Messages.shift("income", Verdict.UNCERTAIN),
                Messages.quality("height", FindingKind.OUT_OF_RANGE), Messages.shift("age", Verdict.MATERIAL)));
        RollUp r = rollUp(given, RollUp.NotSent.NONE, null);
        List<String> headings = List.copyOf(r.groups().keySet());
        assertEquals(List.of("MATERIAL", "UNCERTAIN", "Data quality: " + firstOf(FindingKind.PLACEHOLDER,
                FindingKind.OUT_OF_RANGE), "Data quality: " + secondOf(FindingKind.PLACEHOLDER,
                FindingKind.OUT_OF_RANGE)), headings);
        String text = r.text();
        assertTrue(text.indexOf("age (SHIFT, MATERIAL)") < text.indexOf("income (SHIFT, UNCERTAIN)"), text);
        assertTrue(text.contains("wave w2 against w1, region (PLACEHOLDER): Odd values in region."), text);
        assertEquals("[Wavewarden] survey: 4 new alerts (1 MATERIAL, 1 UNCERTAIN, 2 data quality), firing"
                + " digest-20261203T011500Z", r.subject());
    }

    @Test
    void theCountsOfWhatWasNotSentOnItsOwnAreEachNamed() {
        RollUp r = rollUp(List.of(Messages.message(Messages.shift("age", Verdict.MATERIAL))),
                new RollUp.NotSent(2, 1, 4, 3, 5), "https://reports.example/survey-1/digest-x/digest.html");
        String text = r.text();
        assertTrue(text.contains("Not sent on their own: 15\n"), text);
        assertTrue(text.contains("- explained (expected change or reviewer): 2\n"), text);
        assertTrue(text.contains("- muted: 1\n"), text);
        assertTrue(text.contains("- still present from the previous wave: 4\n"), text);
        assertTrue(text.contains("- still too few answers to judge: 3\n"), text);
        assertTrue(text.contains("- not taken by this sink's filter: 5\n"), text);
        assertTrue(text.endsWith("\nDigest: https://reports.example/survey-1/digest-x/digest.html\n"), text);
        assertFalse(rollUp(List.of(), RollUp.NotSent.NONE, null).text().contains("Digest:"));
    }

    @Test
    void dataInTheTextStaysOnItsLine() {
        AlertMessage odd = AlertMessage.ofRun("survey", "w2\nMATERIAL fake", "w1", 7L, "abc123", List.of(
                Messages.shift("age", Verdict.MATERIAL))).get(0);
        String text = rollUp(List.of(odd), RollUp.NotSent.NONE, null).text();
        assertTrue(text.contains("- wave w2\\nMATERIAL fake against w1, age"), text);
        assertFalse(text.lines().anyMatch(l -> l.startsWith("MATERIAL fake")), text);
    }

    @Test
    void theKeyIsTheSameForTheSameRowAndDiffersBetweenSinks() {
        assertEquals(KEY, RollUp.idempotencyKey("survey", "email:relay:587", "roll-up of /out/digest-x"));
        assertFalse(KEY.equals(RollUp.idempotencyKey("survey", "webhook:http://h/x", "roll-up of /out/digest-x")));
    }

    private static FindingKind firstOf(FindingKind a, FindingKind b) {
        return a.ordinal() < b.ordinal() ? a : b;
    }

    private static FindingKind secondOf(FindingKind a, FindingKind b) {
        return a.ordinal() < b.ordinal() ? b : a;
    }
}
