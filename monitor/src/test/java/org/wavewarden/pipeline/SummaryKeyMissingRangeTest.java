package org.wavewarden.pipeline;

import org.junit.jupiter.api.Test;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.profile.ColumnType;

import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;

/** A stored summary screened without a missing range is not reused once a range is declared, nor after it moves. */
class SummaryKeyMissingRangeTest {

    static DatasetConfig dataset(String ranges) {
        return ConfigLoader.parse("""
                source: {jdbcUrl: "jdbc:postgresql://127.0.0.1:1/survey", user: reader}
                datasets:
                  - name: labour
                    table: survey.labour
                    waveColumn: wave
                    variables:
                      - {name: hours, kind: continuous%s}
                """.formatted(ranges)).dataset("labour");
    }

    static final Map<String, ColumnType> SCHEMA = Map.of("wave", ColumnType.TEXT, "hours", ColumnType.INTEGER);

    @Test
    void declaringOrMovingAMissingRangeChangesTheSummaryKey() {
        SummaryKey none = SummaryKey.of(dataset(""), SCHEMA);
        SummaryKey range = SummaryKey.of(dataset(", missingRanges: [{min: -99, max: -90}]"), SCHEMA);
        SummaryKey moved = SummaryKey.of(dataset(", missingRanges: [{min: -99, max: -91}]"), SCHEMA);
        SummaryKey open = SummaryKey.of(dataset(", missingRanges: [{max: -90}]"), SCHEMA);
        assertNotEquals(none, range);
        assertNotEquals(range, moved);
        assertNotEquals(range, open);
        assertEquals(range, SummaryKey.of(dataset(", missingRanges: [{min: -99, max: -90}]"), SCHEMA));
    }
}
