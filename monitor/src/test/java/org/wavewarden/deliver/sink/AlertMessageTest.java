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
                "effect", "pValue", "qValue", "facets", "idempotencyKey"), names);
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

    @Test
    void anEventsMessageIsNamedByItsLeadListsEveryFacetAndKeepsTheLeadsKey() {
        Finding paired = new Finding("age", FindingKind.PANEL_SHIFT, "paired t", 4.0, 1e-4, 2e-4,
                new Finding.Effect("mean difference", 2.0, 1.0, 3.0, 1.0), Verdict.MATERIAL, 500L, 500L,
                "The same respondents report higher ages.", null);
        Finding weighted = Messages.shift("age", Verdict.UNCERTAIN);
        AlertMessage m = AlertMessage.of("survey", "w2", "w1", 7L, "abc123",
                new org.wavewarden.deliver.Alert(List.of(paired, weighted)));
        assertEquals(FindingKind.PANEL_SHIFT, m.kind());
        assertEquals(paired.sentence(), m.sentence());
        assertEquals(AlertMessage.idempotencyKey("survey", "w2", "w1", "age", FindingKind.PANEL_SHIFT, "abc123"),
                m.idempotencyKey(), "the key the lead had as an alert of its own");
        assertEquals(List.of(org.wavewarden.deliver.Alert.Facet.PAIRED, org.wavewarden.deliver.Alert.Facet.DISTRIBUTION),
                m.facets().stream().map(AlertMessage.Part::facet).toList());
        assertEquals(List.of(Verdict.MATERIAL, Verdict.UNCERTAIN),
                m.facets().stream().map(AlertMessage.Part::verdict).toList());
        assertEquals(weighted.qValue(), m.facets().get(1).qValue());
        assertEquals(m, AlertMessage.fromJson(m.toJson()));
        JsonNode facet = Json.read(m.toJson(), JsonNode.class).get("facets").get(1);
        assertEquals("DISTRIBUTION", facet.get("facet").asText());
        assertEquals("SHIFT", facet.get("kind").asText());
    }

    @Test
    void aMessageWrittenBeforeAlertsWereGroupedReadsWithItsLeadAsItsOneFacet() {
        AlertMessage m = Messages.message(Messages.quality("region", FindingKind.PLACEHOLDER));
        com.fasterxml.jackson.databind.node.ObjectNode old = Json.read(m.toJson(),
                com.fasterxml.jackson.databind.node.ObjectNode.class);
        old.remove("facets");
        AlertMessage read = AlertMessage.fromJson(old.toString());
        assertEquals(m, read);
        assertEquals(List.of(new AlertMessage.Part(org.wavewarden.deliver.Alert.Facet.DATA_QUALITY,
                FindingKind.PLACEHOLDER, null, m.sentence(), null, null, null)), read.facets());
    }

    @Test
    void facetsThatDoNotStartWithTheLeadAreRefused() {
        AlertMessage m = Messages.message(Messages.shift("age", Verdict.MATERIAL));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> new AlertMessage(
                m.dataset(), m.wave(), m.againstWave(), m.runId(), m.variable(), FindingKind.PANEL_SHIFT, m.verdict(),
                m.sentence(), m.effect(), m.pValue(), m.qValue(), m.facets(), m.idempotencyKey()));
        assertTrue(e.getMessage().startsWith("facets:"), e.getMessage());
    }
}
