package org.wavewarden.deliver.html;

import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;
import org.wavewarden.profile.NumericDistribution;

import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;

/** Realistic digest inputs built from seeded random waves: a numeric shift, a category shift, a missing-rate jump. */
final class DigestFixtures {

    static final String INJECTION = "<script>alert(1)</script>";
    static final Instant AT = Instant.parse("2025-07-01T06:15:00Z");
    static final List<String> WAVES = List.of("2024-Q1", "2024-Q2", "2024-Q3", "2024-Q4", "2025-Q1");

    private DigestFixtures() {
    }

    /** Commute minutes, rounded to whole minutes, roughly log-normal; the current wave is longer by a third. */
    static NumericDistribution commute(Random rnd, int n, double scale) {
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = Math.max(1, Math.round(scale * Math.exp(0.5 * rnd.nextGaussian())));
        }
        return NumericDistribution.ofSample(x);
    }

    static Finding shift(String variable, Verdict v, double estimate, double lo, double hi, double threshold,
                         String effectName, String sentence) {
        return new Finding(variable, FindingKind.SHIFT, "Mann-Whitney U", 3.4e6, 1e-9, 1e-8,
                new Finding.Effect(effectName, estimate, lo, hi, threshold), v, 2567L, 2635L, sentence, null);
    }

    /** A wave with three alerts (numeric, categorical with a hostile label, missing rate) and one STABLE finding. */
    static WaveSection busyWave() {
        Random rnd = new Random(20250701L);
        NumericDistribution b = commute(rnd, 2567, 24);
        NumericDistribution c = commute(rnd, 2635, 32);
        Finding commute = shift("commute_minutes", Verdict.MATERIAL, 0.276, 0.245, 0.306, 0.147, "Cliff's delta",
                "Median commute_minutes rose from 24.00 to 32.00 minutes (shift +7.00, 95% CI +7.00 to +8.00 minutes);"
                        + " chance alone would give a gap this large in fewer than 1 in 1,000 comparisons.");
        Finding mode = new Finding("interview_mode", FindingKind.SHIFT, "Pearson chi-square", 2300.0, 1e-300, 1e-299,
                new Finding.Effect("Cram\u00e9r's V", 0.618, 0.60, 0.64, 0.1), Verdict.MATERIAL, 4000L, 4000L,
                "Share answering 'telephone' rose from 7.8% to 78.5% (+70.7 points).", null);
        Finding missing = new Finding("height_cm", FindingKind.MISSING_RATE_CHANGE, "two-proportion z", 8.9, 4e-19,
                5e-18, new Finding.Effect("Cohen's h", 0.282, 0.239, 0.325, 0.2), Verdict.MATERIAL, 4000L, 4200L,
                "Share missing (disguised: numeric sentinel) rose from 0.0% to 2.0% (+2.0 points).", null);
        Finding fee = new Finding("mooring_fee", FindingKind.SHIFT, "Welch t", 1.69, 0.096, 0.583,
                new Finding.Effect("Hedges' g", 0.394, -0.069, 0.854, 0.2), Verdict.UNCERTAIN, 35L, 37L,
                "Mean mooring_fee rose from 779.5 to 834.2 currency per year (+54.7); UNCERTAIN.", null);
        Finding stable = shift("age", Verdict.STABLE, 0, -1, 1, 3, "Hodges-Lehmann shift", "Median age stayed.");
        FindingsReport report = new FindingsReport("harrowmere-household", "2025-Q1", "2024-Q4", AT, 0.05,
                "BENJAMINI_HOCHBERG", List.of(), List.of(commute, mode, missing, fee, stable));

        double[] fb = new double[35];
        double[] fc = new double[37];
        for (int i = 0; i < fb.length; i++) {
            fb[i] = Math.round(780 + 139 * rnd.nextGaussian());
        }
        for (int i = 0; i < fc.length; i++) {
            fc[i] = Math.round(834 + 136 * rnd.nextGaussian());
        }
        List<AlertView> alerts = new ArrayList<>();
        // given out of reading order on purpose: the digest must sort them
        alerts.add(new AlertView(fee, new VariablePlot.NumericPlot("currency per year",
                NumericDistribution.ofSample(fb), NumericDistribution.ofSample(fc)), null));
        alerts.add(new AlertView(commute, new VariablePlot.NumericPlot("minutes", b, c),
                new Trend("median commute", "minutes", WAVES, List.of(24.0, 24.0, Double.NaN, 24.0, 32.0))));
        alerts.add(new AlertView(mode, new VariablePlot.SharesPlot(List.of("web", "telephone", "in_person", INJECTION),
                new long[]{2100, 312, 1580, 8}, new long[]{420, 3140, 430, 10}),
                new Trend("share telephone", "%", WAVES, List.of(7.5, 8.1, 7.7, 7.8, 78.5))));
        alerts.add(new AlertView(missing, new VariablePlot.MissingPlot(List.of("NULL", "disguised: numeric sentinel"),
                new long[]{120, 0}, 4000, new long[]{131, 83}, 4200), null));
        return new WaveSection(report, alerts);
    }

    /** A first wave, screened alone, with nothing to show. */
    static WaveSection quietWave() {
        FindingsReport r = new FindingsReport("harrowmere-household", "2024-Q1", null, AT, 0.05, "BENJAMINI_HOCHBERG",
                List.of(), List.of());
        return new WaveSection(r, List.of());
    }
}
