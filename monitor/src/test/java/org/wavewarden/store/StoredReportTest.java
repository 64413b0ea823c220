package org.wavewarden.store;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.compare.relation.RelationshipDetail;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.deliver.Json;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.pipeline.JudgedWave;
import org.wavewarden.pipeline.Session;
import org.wavewarden.pipeline.WaveJudge;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A wave's findings files are made from the results schema, not from the objects the judge held: what the schema
 * gives back says exactly what the judged wave said, and the file on disk is that.
 */
class StoredReportTest {

    @TempDir
    Path dir;

    @Test
    void theReportReadBackFromTheResultsSchemaSaysWhatTheJudgedWaveSaid() throws Exception {
        String url = TestDatabase.freshDatabase("stored_report");
        SmallSurvey.createTable(url);
        Path[] csv = SmallSurvey.writeWaves(dir);
        String yaml = SmallSurvey.config(url, "    relationships: [{x: score, y: spread}]");
        Path config = dir.resolve("c.yaml");
        Files.writeString(config, yaml);
        for (int w = 1; w <= 3; w++) {
            assertEquals(0, CliRun.of("import", "--config", config.toString(), "--wave", "w" + w,
                    csv[w - 1].toString()).exitCode());
        }
        WardenConfig cfg = ConfigLoader.parse(yaml);
        int relationships = 0;
        try (Session s = Session.open(cfg, null, Map.of())) {
            s.migrate();
            WaveJudge judge = new WaveJudge(s, Clock.systemUTC());
            for (String wave : new String[] {"w1", "w2", "w3"}) {
                Path out = dir.resolve("out-" + wave);
                JudgedWave j = judge.judge(cfg.datasets().get(0), wave, null, out, null);
                FindingsReport said = j.report();
                FindingsReport stored = s.store().storedReport(j.runId()).orElseThrow();
                assertEquals(said.dataset(), stored.dataset());
                assertEquals(said.wave(), stored.wave());
                assertEquals(said.againstWave(), stored.againstWave());
                // The database keeps microseconds, rounded.
                assertTrue(java.time.Duration.between(said.generatedAt(), stored.generatedAt()).abs().toNanos() <= 500,
                        said.generatedAt() + " stored as " + stored.generatedAt());
                assertEquals(said.alpha(), stored.alpha());
                assertEquals(said.fdrMethod(), stored.fdrMethod());
                assertEquals(said.inference(), stored.inference());
                assertEquals(FindingsReport.SCHEMA_VERSION, stored.schemaVersion());
                assertEquals(said.toolVersion(), stored.toolVersion());
                assertEquals(said.configFingerprint(), stored.configFingerprint());
                assertEquals(said.fdrFamilySize(), stored.fdrFamilySize());
                assertEquals(tree(said.findings()), tree(stored.findings()), wave);
                for (Finding f : stored.findings()) {
                    if (f.kind() == FindingKind.RELATIONSHIP_CHANGE && f.verdict() != null) {
                        assertInstanceOf(RelationshipDetail.class, f.detail(), "the HTML digest draws it");
                        relationships++;
                    }
                }
                JsonNode onDisk = Json.mapper().readTree(Files.readString(out.resolve("findings.json")));
                assertEquals(Json.mapper().readTree(Json.write(stored)), onDisk);
            }
        }
        assertTrue(relationships > 0, "a relationship was judged");
    }

    /** Findings as JSON trees: a stored detail is a JSON object whose key order the database does not keep. */
    static JsonNode tree(Object value) throws Exception {
        JsonNode n = Json.mapper().readTree(Json.write(value));
        for (JsonNode f : n) {
            if (f.get("detail").isObject() && f.get("detail").isEmpty()) {
                ((com.fasterxml.jackson.databind.node.ObjectNode) f).putNull("detail");
            }
        }
        return n;
    }
}
