package org.wavewarden.deliver.sink;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.Test;
import org.wavewarden.deliver.Json;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.Iterator;
import java.util.List;
import java.util.Random;
import java.util.Set;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

class AlertMessageTest {

    @Test
    void idempotencyKeyIsSha256OfTheBarJoinedParts() {
        // GNU coreutils sha256sum: printf 'survey|w2|w1|age|SHIFT|abc123' | sha256sum
        assertEquals("82a2f3d6ee34427c4add5d53615657c394f9bb194c84b30536733683f90754d8",
                AlertMessage.idempotencyKey("survey", "w2", "w1", "age", FindingKind.SHIFT, "abc123"));
    }

    @Test
    void missingComparisonWaveCountsAsEmpty() {
        // GNU coreutils sha256sum: printf 'survey|w1||age|BLANK|abc123' | sha256sum
        String expected = "851a3cb511788a69b104edff60a5f7a7ec312eea7fd63ac5f19bae9c94a79f94";
        assertEquals(expected, AlertMessage.idempotencyKey("survey", "w1", null, "age", FindingKind.BLANK, "abc123"));
        assertEquals(expected, AlertMessage.idempotencyKey("survey", "w1", "", "age", FindingKind.BLANK, "abc123"));
    }

    @Test
    void barsInsidePartsCannotMakeTwoAlertsShareAKey() {
        assertNotEquals(AlertMessage.idempotencyKey("a|b", "c", "w1", "v", FindingKind.SHIFT, "x"),
                AlertMessage.idempotencyKey("a", "b|c", "w1", "v", FindingKind.SHIFT, "x"));
        assertNotEquals(AlertMessage.idempotencyKey("a\\", "|c", "w1", "v", FindingKind.SHIFT, "x"),
                AlertMessage.idempotencyKey("a\\|", "c", "w1", "v", FindingKind.SHIFT, "x"));
    }

    @Test
    void everyPartOfTheKeyMattersOnSeededRandomTuples() {
        Random rnd = new Random(20240611L);
        Set<String> keys = new HashSet<>();
        for (int i = 0; i < 200; i++) {
            String[] parts = new String[5];
            for (int j = 0; j < parts.length; j++) {
                parts[j] = "p" + rnd.nextInt(1000);
            }
            FindingKind kind = FindingKind.values()[rnd.nextInt(FindingKind.values().length)];
            String base = AlertMessage.idempotencyKey(parts[0], parts[1], parts[2], parts[3], kind, parts[4]);
            keys.add(base);
            for (int j = 0; j < parts.length; j++) {
                String[] changed = parts.clone();
                changed[j] = changed[j] + "x";
                assertNotEquals(base, AlertMessage.idempotencyKey(changed[0], changed[1], changed[2], changed[3],
                        kind, changed[4]), "part " + j);
            }
            FindingKind other = FindingKind.values()[(kind.ordinal() + 1) % FindingKind.values().length];
            assertNotEquals(base, AlertMessage.idempotencyKey(parts[0], parts[1], parts[2], parts[3], other,
                    parts[4]));
            assertEquals(base, AlertMessage.idempotencyKey(parts[0], parts[1], parts[2], parts[3], kind, parts[4]));
        }
        assertTrue(keys.size() > 190, "distinct tuples give distinct keys");
    }

    @Test
    void verdictAndSentenceDoNotChangeTheKey() {
        AlertMessage a = Messages.message(Messages.shift("age", Verdict.MATERIAL));
        AlertMessage b = Messages.message(Messages.shift("age", Verdict.UNCERTAIN));
        assertEquals(a.idempotencyKey(), b.idempotencyKey());
    }

    @Test
    void jsonCarriesTheContractFieldsAndReadsBack() {
        AlertMessage m = Messages.message(Messages.shift("age", Verdict.MATERIAL));
        JsonNode node = Json.read(m.toJson(), JsonNode.class);
        List<String> names = new ArrayList<>();
        for (Iterator<String> it = node.fieldNames(); it.hasNext(); ) {
            names.add(it.next());
        }
        assertEquals(List.of("dataset", "wave", "againstWave", "runId", "variable", "kind", "verdict", "sentence",
                "effect", "pValue", "qValue", "idempotencyKey"), names);
        assertEquals("MATERIAL", node.get("verdict").asText());
        assertEquals(0.147, node.get("effect").get("threshold").asDouble());
        assertEquals(m, AlertMessage.fromJson(m.toJson()));
        assertTrue(!m.toJson().contains("\n"), "one line");
    }

    @Test
    void dataQualityFindingKeepsNullsForTheMissingTest() {
        AlertMessage m = Messages.message(Messages.quality("region", FindingKind.PLACEHOLDER));
        JsonNode node = Json.read(m.toJson(), JsonNode.class);
        assertTrue(node.get("verdict").isNull());
        assertTrue(node.get("pValue").isNull());
        assertNull(AlertMessage.fromJson(m.toJson()).effect());
    }

    @Test
    void malformedKeyIsRefusedNamingTheField() {
        Finding f = Messages.shift("age", Verdict.MATERIAL);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> new AlertMessage("s", "w",
                null, 1, "v", FindingKind.SHIFT, Verdict.MATERIAL, "x", f.effect(), 0.1, 0.1, "XYZ"));
        assertTrue(e.getMessage().startsWith("idempotencyKey:"), e.getMessage());
        IllegalArgumentException e2 = assertThrows(IllegalArgumentException.class,
                () -> AlertMessage.idempotencyKey("s", "w", null, "v", FindingKind.SHIFT, ""));
        assertTrue(e2.getMessage().startsWith("runChecksum:"), e2.getMessage());
    }
}
