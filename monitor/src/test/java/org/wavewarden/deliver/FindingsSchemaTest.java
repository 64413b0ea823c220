package org.wavewarden.deliver;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.VariableComparator;
import org.wavewarden.config.WardenConfig.FdrMethod;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Judge;
import org.wavewarden.profile.NumericDistribution;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.TreeSet;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * findings.json as written matches its JSON Schema, and the schema is strict: a missing field, an unknown one, a
 * q-value without its family or a df without its convention is refused. (The demo's files of both datasets are
 * held to it in {@code DemoManifestTest}.)
 */
class FindingsSchemaTest {

    @TempDir
    Path dir;

    private JsonNode written() throws Exception {
        VariableComparator v = new VariableComparator(0.95);
        List<Comparison> c = new ArrayList<>();
        c.add(v.numeric("score", false, NumericDistribution.ofSample(new double[] {10.1, 11.3, 9.8, 10.7, 12.0, 10.4}),
                NumericDistribution.ofSample(new double[] {11.2, 12.4, 10.9, 11.8, 12.9, 11.5}), null, "points"));
        c.add(v.proportion("smoker", FindingKind.SHIFT, "answering 'yes'", 40, 200, 62, 210, null));
        List<Finding> findings = new ArrayList<>(Judge.judge(c, 0.05, FdrMethod.BENJAMINI_HOCHBERG));
        findings.add(Finding.dataQuality("age", FindingKind.CONSTANT, 10L, 12L, "Every valid answer is 30.", null));
        FindingsReport r = new FindingsReport("survey", "w2", "w1", Instant.parse("2025-07-01T06:15:00Z"), 0.05,
                "BENJAMINI_HOCHBERG", List.of("note"), findings, ToolVersion.current(), "ab".repeat(32));
        Path json = FindingsFiles.write(dir, r);
        return Json.mapper().readTree(Files.readString(json));
    }

    @Test
    void aWrittenFindingsFileMatchesTheSchema() throws Exception {
        JsonNode doc = written();
        assertEquals(List.of(), FindingsSchema.problems(doc));
        assertEquals(FindingsReport.SCHEMA_VERSION, doc.get("schemaVersion").asInt());
        assertEquals(2, doc.get("fdrFamilySize").asInt());
    }

    @Test
    void aMissingHeaderFieldIsRefused() throws Exception {
        for (String field : List.of("schemaVersion", "toolVersion", "configFingerprint", "fdrFamilySize")) {
            ObjectNode doc = (ObjectNode) written();
            doc.remove(field);
            assertFalse(FindingsSchema.problems(doc).isEmpty(), "without " + field);
        }
    }

    @Test
    void aFindingWithoutAFieldOrWithAnUnknownOneIsRefused() throws Exception {
        for (String field : List.of("df", "dfConvention", "fdrFamilySize", "fdrMethod", "qValue", "sentence")) {
            ObjectNode doc = (ObjectNode) written();
            ((ObjectNode) doc.get("findings").get(0)).remove(field);
            assertFalse(FindingsSchema.problems(doc).isEmpty(), "without " + field);
        }
        ObjectNode doc = (ObjectNode) written();
        ((ObjectNode) doc.get("findings").get(0)).put("extra", 1);
        assertFalse(FindingsSchema.problems(doc).isEmpty(), "an unknown field");
    }

    @Test
    void aQValueWithoutItsFamilyAndADfWithoutItsConventionAreRefused() throws Exception {
        ObjectNode doc = (ObjectNode) written();
        ObjectNode tested = (ObjectNode) doc.get("findings").get(0);
        assertTrue(tested.get("qValue").isNumber() && tested.get("df").isNumber(), tested.toString());
        tested.putNull("fdrFamilySize");
        assertFalse(FindingsSchema.problems(doc).isEmpty(), "q without its family size");
        doc = (ObjectNode) written();
        ((ObjectNode) doc.get("findings").get(0)).putNull("dfConvention");
        assertFalse(FindingsSchema.problems(doc).isEmpty(), "df without its convention");
    }

    @Test
    void theSchemaListsEveryKindOfFinding() {
        TreeSet<String> listed = new TreeSet<>();
        FindingsSchema.schema().at("/$defs/finding/properties/kind/enum").forEach(k -> listed.add(k.asText()));
        TreeSet<String> kinds = new TreeSet<>(Arrays.stream(FindingKind.values()).map(Enum::name).toList());
        assertEquals(kinds, listed, "a new FindingKind is added to docs/findings.schema.json");
    }
}
