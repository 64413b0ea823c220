package org.wavewarden.judge;

import org.junit.jupiter.api.Test;
import org.wavewarden.compare.domain.Breakdown;
import org.wavewarden.compare.domain.DomainChange;
import org.wavewarden.config.Breakdowns;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.pipeline.WaveJudge;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.profile.DomainTally;
import org.wavewarden.profile.WaveProfile;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The run's judgement with breakdowns configured, from two wave summaries as the scan leaves them (domain tallies
 * beside the whole wave's): a rise in one district is found MATERIAL, broken down by district and by interview
 * mode, and the sentence says where it happened, while the mode that shows no difference only adds its table.
 *
 * <p>The data: six districts of 400 households in each wave, half owning a car in every district of the first wave;
 * in the second, 90% in KES and 51% elsewhere. Each interview mode holds half of every district's households, so the
 * change is the same in both modes.
 */
class WhereItChangedInTheRunTest {

    private static final List<String> DISTRICTS = List.of("GUL", "SAL", "BRN", "TID", "MOR", "KES");

    private static final String YAML = """
            source:
              jdbcUrl: "jdbc:postgresql://127.0.0.1:1/unused"
              user: postgres
            results:
              schema: ww_results
            alpha: 0.05
            datasets:
              - name: harrowmere-household
                table: src.household
                waveColumn: wave
                variables:
                  - name: owns_car
                    kind: binary
                    successValue: "yes"
                    threshold: {points: 3}
            """;

    private static ColumnTally yesNo(long yes, long rows) {
        return new ColumnTally("owns_car", ColumnType.TEXT, rows, 0, Map.of("yes", yes, "no", rows - yes), false);
    }

    private static WaveProfile wave(String wave, long[] yesByDistrict) {
        List<ColumnTally> byDistrict = new ArrayList<>();
        long yes = 0;
        for (long y : yesByDistrict) {
            byDistrict.add(yesNo(y, 400));
            yes += y;
        }
        long[] rows = new long[DISTRICTS.size()];
        java.util.Arrays.fill(rows, 400);
        DomainTally district = new DomainTally("district", DISTRICTS, rows, 0, 0, 0,
                Map.of("owns_car", byDistrict), null, null);
        // Half of every district's households in each mode: the same yes count in both.
        DomainTally mode = new DomainTally("interview_mode", List.of("web", "telephone"), new long[] {1200, 1200}, 0,
                0, 0, Map.of("owns_car", List.of(yesNo(yes / 2, 1200), yesNo(yes / 2, 1200))), null, null);
        Map<String, ColumnType> schema = new LinkedHashMap<>();
        schema.put("owns_car", ColumnType.TEXT);
        return new WaveProfile(wave, 2400, schema, Map.of("owns_car", yesNo(yes, 2400)), Map.of(), null, List.of(),
                List.of(district, mode));
    }

    private static DatasetConfig withBreakdowns(DatasetConfig d, Breakdowns b) {
        return new DatasetConfig(d.name(), d.table(), d.waveColumn(), d.tablePattern(), d.waveOrder(),
                d.compareWith(), d.schedule(), d.exclude(), d.variables(), d.quietPeriod(), d.alerts(),
                d.readyTable(), d.readyColumn(), d.weightColumn(), d.respondentKey(), d.releases(), d.design(),
                d.relationships(), d.codebook(), d.population(), d.alertRules(), b);
    }

    @Test
    void aRiseInOneDistrictIsBrokenDownAndTheSentenceSaysWhere() {
        WardenConfig cfg = ConfigLoader.parse(YAML);
        DatasetConfig d = withBreakdowns(cfg.datasets().get(0), new Breakdowns(List.of("district", "interview_mode"),
                500, null, 20, List.of(), 0.02, 5000));
        WaveProfile before = wave("2025-Q1", new long[] {200, 200, 200, 200, 200, 200});
        WaveProfile after = wave("2025-Q2", new long[] {204, 204, 204, 204, 204, 360});

        List<Finding> findings = WaveJudge.findings(cfg, d, after, before).findings();

        Finding shift = findings.stream().filter(f -> f.kind() == FindingKind.SHIFT
                && f.variable().equals("owns_car")).findFirst().orElseThrow();
        assertEquals(Verdict.MATERIAL, shift.verdict(), shift.sentence());
        assertEquals(List.of("district", "interview_mode"), shift.breakdowns().stream().map(Breakdown::column)
                .toList());
        Breakdown district = shift.breakdowns().get(0);
        DomainChange kes = district.domains().get(0);
        assertEquals("KES", kes.domain(), "ranked first by its contribution");
        // R 4.2.2, survey 4.1.1, on the rows these tallies count (2 waves x 6 districts x 400 households):
        // svyby(~y, ~district + wave, svydesign(ids = ~1, strata = ~wave), svymean): KES 0.50 -> 0.90, others
        // 0.50 -> 0.51; regTermTest(svyglm(y ~ district * wave, design), ~district:wave, method = "Wald",
        // df = Inf): chisq = 138.221396427114 on 5 df, p = 4.27e-28.
        assertEquals(0.40, kes.change(), 1e-12);
        assertEquals(0.01, district.elsewhere(), 1e-12);
        assertEquals(5, district.df());
        assertEquals(138.221396427114, district.statistic(), 1e-6);
        // Two breakdown tests in the run: BH over {p(district), p(mode)}; the district's q is twice its p.
        assertEquals(2 * district.pValue(), district.qValue(), 1e-30);
        Breakdown mode = shift.breakdowns().get(1);
        assertEquals(0.0, mode.statistic(), 1e-9, "the same change in both modes");
        assertTrue(mode.qValue() > 0.05);
        assertTrue(shift.sentence().endsWith(" The rise is concentrated in district KES (+40.0 points; elsewhere"
                + " +1.0); the change differs across districts (q < 0.001)."), shift.sentence());
        assertTrue(!shift.sentence().contains("interview mode"), "a breakdown with no difference adds no words");
    }
    private static Map<String, Long> weights(int each, long sentinels) {
        Map<String, Long> m = new LinkedHashMap<>();
        for (int kg = 55; kg < 95; kg++) {
            m.put(String.valueOf(kg), (long) each);
        }
        if (sentinels > 0) {
            m.put("999", sentinels);
        }
        return m;
    }

    @Test
    void sentinelsKeyedInOneDistrictAreBrokenDownByTheirRateOfRows() {
        WardenConfig cfg = ConfigLoader.parse(YAML.replace("      - name: owns_car",
                "      - name: weight_kg\n        kind: continuous\n        unit: kg\n      - name: owns_car"));
        DatasetConfig d = withBreakdowns(cfg.datasets().get(0), new Breakdowns(List.of("district"), 500, null, 20,
                List.of(), 0.02, 5000));
        WaveProfile[] waves = new WaveProfile[2];
        for (int w = 0; w < 2; w++) {
            List<ColumnTally> byDistrict = new ArrayList<>();
            Map<String, Long> whole = new LinkedHashMap<>();
            for (String district : DISTRICTS) {
                // In the second wave KES keys 80 of its 400 weights as 999; no district does in the first.
                boolean keyed = w == 1 && district.equals("KES");
                Map<String, Long> t = keyed ? weights(8, 80) : weights(10, 0);
                t.forEach((v, n) -> whole.merge(v, n, Long::sum));
                byDistrict.add(new ColumnTally("weight_kg", ColumnType.INTEGER, 400, 0, t, false));
            }
            long[] rows = new long[DISTRICTS.size()];
            java.util.Arrays.fill(rows, 400);
            DomainTally district = new DomainTally("district", DISTRICTS, rows, 0, 0, 0,
                    Map.of("weight_kg", byDistrict), null, null);
            Map<String, ColumnType> schema = new LinkedHashMap<>();
            schema.put("weight_kg", ColumnType.INTEGER);
            waves[w] = new WaveProfile(w == 0 ? "2025-Q1" : "2025-Q2", 2400, schema, Map.of("weight_kg",
                    new ColumnTally("weight_kg", ColumnType.INTEGER, 2400, 0, whole, false)), Map.of(), null,
                    List.of(), List.of(district));
        }

        List<Finding> findings = WaveJudge.findings(cfg, d, waves[1], waves[0]).findings();

        Finding sentinel = findings.stream().filter(f -> f.kind() == FindingKind.NUMERIC_SENTINEL)
                .findFirst().orElseThrow(() -> new AssertionError(findings.toString()));
        assertEquals(1, sentinel.breakdowns().size(), sentinel.toString());
        Breakdown b = sentinel.breakdowns().get(0);
        assertEquals("share of rows holding '999'", b.measure());
        assertEquals("KES", b.domains().get(0).domain());
        // 80 of KES's 400 rows against none before; none of the other 2,000 rows in either wave
        assertEquals(0.20, b.domains().get(0).change(), 1e-12);
        assertEquals(0.0, b.elsewhere(), 1e-12);
        assertEquals(80 / 2400.0, b.overall(), 1e-12);
        // No other district has a 999 in either wave: their rates have no variance, the test has no degrees of
        // freedom (R's regTermTest stops on the singular covariance), and the counts say where the rows are.
        assertEquals(0, b.df());
        assertTrue(sentinel.sentence().endsWith(" All 80 rows holding '999' in this wave are in district KES (20.0%"
                + " of its rows; none elsewhere in either wave)."), sentinel.sentence());
    }
}
