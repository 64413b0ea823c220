package org.wavewarden.pipeline;

import com.fasterxml.jackson.databind.JsonNode;
import org.jdbi.v3.core.Jdbi;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.postgresql.ds.PGSimpleDataSource;
import org.wavewarden.codebook.CodebookMerge;
import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.Measure;
import org.wavewarden.codebook.StorageType;
import org.wavewarden.codebook.VariableMeta;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.deliver.FindingsSchema;
import org.wavewarden.deliver.Json;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.missing.DataQualityFindings;
import org.wavewarden.missing.ScreenedVariable;
import org.wavewarden.profile.CategoryCounts;
import org.wavewarden.store.ResultsSchema;
import org.wavewarden.store.WaveCodebooks;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.time.Instant;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The codebook each wave was imported with, saved in the results schema of a real PostgreSQL server
 * ({@link WaveCodebooks}), shows a label that changed for the same code between two waves: code 3 was 'Council
 * tenant' in 2025-Q1 and is 'Housing association' in 2025-Q2. Codes 1 and 2 keep their labels and are not named.
 */
class WaveCodebookLabelsIntegrationTest {

    static final String RESULTS = "ww_relabel";
    static String url;
    static WaveCodebooks codebooks;
    @TempDir
    static Path dir;

    static DatasetCodebook codebook(String wave, String three) {
        Map<String, String> labels = new LinkedHashMap<>();
        labels.put("1", "Owner occupier");
        labels.put("2", "Private renter");
        labels.put("3", three);
        return new DatasetCodebook("tenure-" + wave + ".sav, SPSS system file", null, List.of(new VariableMeta(
                "tenure", "Tenure of the home", StorageType.NUMBER, null, 0, "F1.0", Measure.NOMINAL, null, labels,
                List.of(), List.of(), null)));
    }

    @BeforeAll
    static void saveTwoWavesCodebooks() throws Exception {
        url = TestDatabase.freshDatabase("wave_codebook_labels");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE SCHEMA h;
                    CREATE TABLE h.w_2025_q1 AS SELECT 1 + g % 3 AS tenure FROM generate_series(1, 300) g;
                    CREATE TABLE h.w_2025_q2 AS SELECT 1 + g % 3 AS tenure FROM generate_series(1, 330) g;
                    """);
        }
        PGSimpleDataSource ds = new PGSimpleDataSource();
        ds.setUrl(url);
        ds.setUser("postgres");
        ResultsSchema.migrate(ds, RESULTS);
        codebooks = new WaveCodebooks(Jdbi.create(ds), RESULTS);
        codebooks.save("housing", "2025_q1", codebook("2025_q1", "Council tenant"), Instant.EPOCH);
        codebooks.save("housing", "2025_q2", codebook("2025_q2", "Housing association"), Instant.EPOCH);
    }

    static ScreenedVariable answers(long one, long two, long three) {
        CategoryCounts counts = new CategoryCounts(List.of("1", "2", "3"), new long[] {one, two, three});
        return new ScreenedVariable(counts.n(), 0, Map.of(), List.of(), List.of(), Map.of(), null, counts, null,
                null);
    }

    @Test
    void aLabelThatChangedForTheSameCodeBetweenTheWavesCodebooksIsALabelChangedFinding() {
        Map<String, String> before = codebooks.load("housing", "2025_q1").orElseThrow().variable("tenure")
                .orElseThrow().valueLabels();
        Map<String, String> after = codebooks.load("housing", "2025_q2").orElseThrow().variable("TENURE")
                .orElseThrow().valueLabels();
        VariableConfig v = new VariableConfig("tenure", VariableKind.CATEGORICAL, null, null, List.of(), null, null,
                List.of(), null, null, "Tenure of the home", after, null);
        Finding f = DataQualityFindings.relabelledCodes(v, answers(100, 100, 100), answers(110, 110, 110), before,
                after, "2025_q1", "2025_q2");
        assertEquals(FindingKind.LABEL_CHANGED, f.kind());
        assertEquals("Code '3' was 'Council tenant' in wave 2025_q1 and is 'Housing association' in wave 2025_q2"
                + " (110 answers now): the same code may not mean the same answer in the two waves.", f.sentence());
        JsonNode detail = Json.mapper().valueToTree(f.detail());
        assertEquals(1, detail.get("codes").size(), detail.toString());
        JsonNode code = detail.get("codes").get(0);
        assertEquals("3", code.get("code").asText());
        assertEquals("Council tenant", code.get("baselineLabel").asText());
        assertEquals("Housing association", code.get("label").asText());
        assertEquals(100, code.get("countBaseline").asLong());
        assertEquals(110, code.get("countCurrent").asLong());
    }

    @Test
    void codebooksThatAgreeGiveNoFinding() {
        Map<String, String> same = codebooks.load("housing", "2025_q1").orElseThrow().variables().get(0).valueLabels();
        VariableConfig v = VariableConfig.inferred("tenure", VariableKind.CATEGORICAL);
        assertNull(DataQualityFindings.relabelledCodes(v, answers(1, 1, 1), answers(1, 1, 1), same, same, "a", "b"));
    }

    /**
     * Through the whole judge: the waves' codebooks are loaded, the current one merged under the (empty) YAML
     * variables, and the finding lands in findings.json with its variable label. Needs the codebook merge.
     */
    @Test
    void aJudgedWaveWhoseCodebookRelabelsACodeReportsItInFindingsJson() throws Exception {
        Assumptions.assumeTrue(mergeIsWritten(), "the codebook merge is not written yet");
        Path config = dir.resolve("h.yaml");
        Files.writeString(config, """
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results: {schema: %s}
                datasets:
                  - name: housing
                    tablePattern: h.w_{wave}
                """.formatted(url, RESULTS));
        for (String wave : List.of("2025_q1", "2025_q2")) {
            CliRun r = CliRun.of("check", "--config", config.toString(), "--wave", wave, "--out",
                    dir.resolve("out-" + wave).toString());
            assertEquals(0, r.exitCode(), r.err() + r.out());
        }
        JsonNode report = Json.mapper().readTree(Files.readString(dir.resolve("out-2025_q2").resolve(
                "findings.json")));
        assertEquals(List.of(), FindingsSchema.problems(report));
        JsonNode changed = null;
        for (JsonNode f : report.get("findings")) {
            if (f.get("kind").asText().equals("LABEL_CHANGED")) {
                changed = f;
            }
        }
        assertTrue(changed != null, report.toPrettyString());
        assertEquals("tenure", changed.get("variable").asText());
        assertEquals("Tenure of the home", changed.get("label").asText());
        assertTrue(changed.get("sentence").asText().startsWith("Code '3' was 'Council tenant' in wave 2025_q1"),
                changed.toString());
    }

    static boolean mergeIsWritten() {
        try {
            CodebookMerge.merge(List.of(), codebook("x", "y"));
            return true;
        } catch (UnsupportedOperationException e) {
            return false;
        }
    }
}
