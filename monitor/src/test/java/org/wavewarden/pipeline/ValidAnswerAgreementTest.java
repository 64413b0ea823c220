package org.wavewarden.pipeline;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.compare.DesignViews;
import org.wavewarden.compare.panel.PairedPanel.NumericPairs;
import org.wavewarden.compare.panel.PairedPanel.Panel;
import org.wavewarden.compare.relation.RelationshipFindings;
import org.wavewarden.config.CompareWith;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.RangeSpec;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.missing.ScreenedVariable;
import org.wavewarden.missing.ValidNumber;
import org.wavewarden.profile.Binning;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.profile.DesignSummary;
import org.wavewarden.profile.JointTally;
import org.wavewarden.profile.WaveProfile;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * The places that decide whether a numeric answer enters a comparison (the screen, the panel's pairs, the design
 * view, the relationships' pairs) agree with {@link ValidNumber} on every answer, because they all ask it.
 */
class ValidAnswerAgreementTest {

    static final VariableConfig HOURS = new VariableConfig("hours", VariableKind.CONTINUOUS, "hours",
            new RangeSpec(0.0, 99.0), List.of(new MissingCodeSpec("-9", "refused")), null, null, List.of(), null);
    static final VariableConfig DAYS = new VariableConfig("days", VariableKind.CONTINUOUS, "days", null, List.of(),
            null, null, List.of(), null);

    static DatasetConfig dataset() {
        return new DatasetConfig("agree", "s.t", "wave", null, null, CompareWith.PREVIOUS, null, List.of(),
                List.of(HOURS, DAYS), null, null, null, null, null, "pid", null, null, List.of());
    }

    /** Three respondents; the third answered {@code answer} to hours. */
    static WaveProfile wave(String label, String answer) {
        Map<String, ColumnType> schema = new LinkedHashMap<>();
        schema.put("pid", ColumnType.INTEGER);
        schema.put("hours", ColumnType.DECIMAL);
        schema.put("days", ColumnType.DECIMAL);
        Map<String, Long> hours = new LinkedHashMap<>();
        hours.put("10", 1L);
        hours.put("20", 1L);
        hours.merge(answer, 1L, Long::sum);
        Map<String, ColumnTally> tallies = new LinkedHashMap<>();
        tallies.put("hours", new ColumnTally("hours", ColumnType.DECIMAL, 3, 0, hours, false));
        tallies.put("days", new ColumnTally("days", ColumnType.DECIMAL, 3, 0, Map.of("1", 1L, "2", 1L, "3", 1L),
                false));
        return new WaveProfile(label, 3, schema, tallies);
    }

    @ParameterizedTest(name = "''{0}''")
    @CsvSource(delimiter = '|', quoteCharacter = '"', textBlock = """
            12
            " 12 "
            0
            99
            1e1
            1e3
            99.5
            -1
            -9
            -9.0
            NaN
            Infinity
            0x1p3
            1.5d
            1e400
            twelve
            """)
    void everyPlaceThatDecidesAValidNumericAnswerAgreesWithTheRule(String answer) {
        boolean valid = ValidNumber.of(HOURS).status(answer) == ValidNumber.Status.VALID;
        long expected = valid ? 3 : 2;
        DatasetConfig d = dataset();
        WaveProfile before = wave("w1", answer);
        WaveProfile after = wave("w2", answer);
        WaveJudge.Screened screened = WaveJudge.screen(d, after, before);
        ScreenedVariable s = screened.current().get("hours").orElseThrow();

        assertEquals(expected, s.numeric().n(), "the screen");

        PanelPairs plan = PanelPairs.plan(d, List.of("w1"), before, after, screened);
        for (int i = 0; i < 3; i++) {
            String[] row = {i == 0 ? "10" : i == 1 ? "20" : answer, String.valueOf(i + 1)};
            plan.row(String.valueOf(i + 1), row, row);
        }
        Panel panel = plan.finish(null);
        assertEquals(expected, ((NumericPairs) panel.variables().get(0)).pairs(), "the panel's pairs");

        Map<String, double[]> cells = new LinkedHashMap<>();
        s.excludedValues().forEach(x -> cells.put(x, new double[] {1, 0}));
        s.invalid().keySet().forEach(x -> cells.put(x, new double[] {1, 0}));
        cells.put("10", new double[] {1, 0});
        cells.put("20", new double[] {0, 1});
        cells.put(answer, new double[] {0, 1});
        DesignSummary design = new DesignSummary(List.of("s", "s"), List.of("p1", "p2"), 0,
                Map.of("hours", new DesignSummary.ColumnDesign(cells, true, null, null, null)));
        DesignViews.View view = DesignViews.numeric(design, after.columns().get("hours"), s, HOURS);
        long inView = 0;
        for (long c : view.tally().counts()) {
            inView += c;
        }
        assertEquals(expected, inView, "the design view");

        // A joint tally only ever holds plain decimal numbers, so the relationships' pairs see only those.
        Double x = ValidNumber.parse(answer);
        if (x != null) {
            JointTally joint = new JointTally("hours", "days", new double[] {10, 20, x}, new double[] {1, 2, 3},
                    new long[] {1, 1, 1}, Binning.EXACT);
            assertEquals(expected, RelationshipFindings.screened(joint, screened.current()).pairCount(),
                    "the relationships' pairs");
        }
    }
}
