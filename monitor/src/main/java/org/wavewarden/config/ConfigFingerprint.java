package org.wavewarden.config;

import com.fasterxml.jackson.annotation.JsonTypeInfo;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.MapperFeature;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.json.JsonMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;

import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;

/**
 * A SHA-256 over the part of the configuration that decides what a run of one dataset finds: the run's alpha and
 * false-discovery-rate method and the dataset as configured (tables, wave order, comparison rule, exclusions,
 * weights, design, respondent key, releases, relationships, every declared variable with its kind, unit, range,
 * codes, threshold and reference, the content digest of its codebook file, and whether it is a census or a full
 * register, judged without tests). Left out, because they change when a wave is judged or what becomes of its
 * alerts but not what it says: the schedule, the quiet period, the ready table, the alert sinks (which may also name
 * secrets), the expected changes and the mute rules. Two runs with equal fingerprints judged their waves under the same
 * rules; variables left to inference are described by the run's inference notes.
 *
 * <p>Canonical form: the configuration records as JSON with properties and map keys in alphabetical order and the
 * comparison rule named by its type, in UTF-8, prefixed by {@link #FORMAT}.
 */
public final class ConfigFingerprint {

    /** Raise when the canonical form changes, so that a changed fingerprint is never read as a changed config. */
    public static final String FORMAT = "wavewarden-config-fingerprint 1";

    private static final ObjectMapper CANONICAL = JsonMapper.builder()
            .enable(MapperFeature.SORT_PROPERTIES_ALPHABETICALLY)
            .enable(SerializationFeature.ORDER_MAP_ENTRIES_BY_KEYS)
            .addModule(new com.fasterxml.jackson.datatype.jsr310.JavaTimeModule())
            .disable(SerializationFeature.WRITE_DURATIONS_AS_TIMESTAMPS)
            .disable(SerializationFeature.FAIL_ON_EMPTY_BEANS)
            .addMixIn(CompareWith.class, NamedRule.class)
            .build();

    /** Names each comparison rule, so that rules without fields stay apart from each other. */
    @JsonTypeInfo(use = JsonTypeInfo.Id.NAME, property = "rule")
    private interface NamedRule {
    }

    private ConfigFingerprint() {
    }

    /** The fingerprint in lower-case hex (64 characters). */
    public static String of(WardenConfig config, DatasetConfig dataset) {
        return of(config.alpha(), config.fdr(), dataset);
    }

    /** The same from the run's alpha and method. */
    public static String of(double alpha, WardenConfig.FdrMethod fdr, DatasetConfig dataset) {
        ObjectNode d = CANONICAL.valueToTree(dataset);
        // Expected changes and mute rules decide what happens to an alert, never what a run finds.
        d.remove(java.util.List.of("schedule", "quietPeriod", "readyTable", "readyColumn", "alerts", "alertRules"));
        if (d.path("codebook").isNull()) {
            d.remove("codebook"); // a dataset without a codebook keeps the fingerprint it had before codebooks existed
        }
        if (d.path("population").asText().equals(Population.SAMPLE.name())) {
            d.remove("population"); // likewise a sample, judged as every dataset was before populations existed
        }
        ObjectNode root = CANONICAL.createObjectNode();
        root.put("alpha", alpha);
        root.put("fdr", fdr.name());
        root.set("dataset", d);
        try {
            String text = FORMAT + "\n" + CANONICAL.writeValueAsString(CANONICAL.treeToValue(root, Object.class));
            return HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256")
                    .digest(text.getBytes(StandardCharsets.UTF_8)));
        } catch (JsonProcessingException | NoSuchAlgorithmException e) {
            throw new IllegalStateException("cannot fingerprint the configuration of " + dataset.name(), e);
        }
    }
}
