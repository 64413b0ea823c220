package org.wavewarden.config;

import org.junit.jupiter.api.Test;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The fingerprint changes with what decides a dataset's findings, and only with that. */
class ConfigFingerprintTest {

    private static String yaml(String alpha, String datasetExtra, String scoreExtra) {
        return """
                source:
                  jdbcUrl: "jdbc:postgresql://127.0.0.1:5432/survey"
                  user: postgres
                results:
                  schema: ww_results
                alpha: %s
                datasets:
                  - name: small-survey
                    table: src.answers
                    waveColumn: wave
                    exclude: [respondent_id]
                %s
                    variables:
                      - name: score
                        kind: continuous
                        unit: points
                %s
                      - name: region
                        kind: categorical
                """.formatted(alpha, datasetExtra, scoreExtra);
    }

    private static String fingerprint(String yaml) {
        WardenConfig c = ConfigLoader.parse(yaml);
        return ConfigFingerprint.of(c, c.datasets().get(0));
    }

    @Test
    void theSameConfigurationGivesTheSameSha256() {
        String a = fingerprint(yaml("0.05", "", ""));
        assertEquals(a, fingerprint(yaml("0.05", "", "")));
        assertTrue(a.matches("[0-9a-f]{64}"), a);
    }

    @Test
    void whatDecidesTheFindingsChangesIt() {
        String base = fingerprint(yaml("0.05", "", ""));
        assertNotEquals(base, fingerprint(yaml("0.01", "", "")), "alpha");
        assertNotEquals(base, fingerprint(yaml("0.05", "", "        threshold: {raw: 2}")), "a threshold");
        assertNotEquals(base, fingerprint(yaml("0.05", "    compareWith: {pooledLast: 3}", "")),
                "the comparison rule");
        assertNotEquals(base, fingerprint(yaml("0.05", "    weightColumn: w", "")), "weights");
    }

    @Test
    void whenAndWhereAWaveIsJudgedDoesNotChangeIt() {
        String base = fingerprint(yaml("0.05", "", ""));
        assertEquals(base, fingerprint(yaml("0.05", "    schedule: \"0 0 6 * * ?\"", "")), "schedule");
        assertEquals(base, fingerprint(yaml("0.05", "    quietPeriod: PT30M", "")), "quiet period");
    }
}
