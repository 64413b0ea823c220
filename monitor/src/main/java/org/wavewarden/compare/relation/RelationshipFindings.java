package org.wavewarden.compare.relation;

import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.Thresholds;
import org.wavewarden.config.RelationshipConfig;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.profile.Binning;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.JointTally;
import org.wavewarden.profile.RelativeBins;
import org.wavewarden.profile.WaveProfile;
import org.wavewarden.missing.ScreenedWave;
import org.wavewarden.missing.ValidNumber;
import org.wavewarden.missing.ScreenedVariable;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Optional;
import java.util.Set;

/**
 * Relationship drift for a dataset's configured pairs: each wave's joint tally, rid of the pairs where either
 * answer is missing as the variable's own screen decides ({@link ScreenedWave}: codebook codes, confident
 * disguised missing values, values outside the declared range, values that are not numbers), compared between the
 * waves by {@link RelationshipChange}. The comparisons join the run's false-discovery-rate family; pairs that
 * cannot be compared get a SKIPPED finding saying why.
 */
public final class RelationshipFindings {

    private static final org.slf4j.Logger LOG = org.slf4j.LoggerFactory.getLogger(RelationshipFindings.class);

    private RelationshipFindings() {
    }

    /** Comparisons and skip notices of every configured relationship; nothing for a first wave. */
    public static void of(List<RelationshipConfig> relationships, WaveProfile current, WaveProfile baseline,
                          ScreenedWave screenedCurrent, ScreenedWave screenedBaseline, double confidence,
                          List<Comparison> comparisons, List<Finding> plain) {
        if (baseline == null) {
            return;
        }
        for (RelationshipConfig r : relationships) {
            try {
                String why = compare(r, current, baseline, screenedCurrent, screenedBaseline, confidence, comparisons);
                if (why != null) {
                    plain.add(Finding.dataQuality(r.label(), FindingKind.SKIPPED, null, null,
                            "Not compared: " + why + ".", null));
                }
            } catch (RuntimeException e) {
                // A value no method foresaw must cost one relationship its comparison, never the whole run.
                LOG.warn("relationship {} of wave {} could not be compared: {}", r.label(), current.wave(),
                        e.toString());
                plain.add(Finding.dataQuality(r.label(), FindingKind.SKIPPED, null, null, "Not compared: the"
                        + " answers could not be analysed (" + e.getClass().getSimpleName() + ": "
                        + String.valueOf(e.getMessage()).lines().findFirst().orElse("") + ").", null));
            }
        }
    }

    /** Adds the relationship's comparison, or returns why there is none. */
    private static String compare(RelationshipConfig r, WaveProfile current, WaveProfile baseline,
                                  ScreenedWave screenedCurrent, ScreenedWave screenedBaseline, double confidence,
                                  List<Comparison> comparisons) {
        VariableConfig vx = screenedCurrent.variable(r.x()).orElse(null);
        VariableConfig vy = screenedCurrent.variable(r.y()).orElse(null);
        Optional<JointTally> c = current.pair(r.x(), r.y());
        if (vx == null || vy == null || c.isEmpty()) {
            return (vx == null ? r.x() : r.y()) + " is not a monitored number in this wave";
        }
        Optional<JointTally> b = baseline.pair(r.x(), r.y());
        if (b.isEmpty()) {
            return "the baseline's summary holds no pairs of " + r.x() + " and " + r.y();
        }
        JointTally cs = screened(c.get(), screenedCurrent);
        JointTally bs = screened(b.get(), screenedBaseline);
        double threshold = r.threshold() != null ? r.threshold() : Thresholds.CORRELATION_DIFFERENCE;
        String source = r.threshold() != null ? "configured " + r.threshold() + " on the difference of Spearman rho"
                : "default " + Thresholds.CORRELATION_DIFFERENCE + " for the difference of Spearman rho (common"
                + " practice, no source)";
        RelationshipChange.Outcome o = RelationshipChange.compare(r.label(), bs, cs, threshold, source, confidence,
                b.get().pairCount() - bs.pairCount(), c.get().pairCount() - cs.pairCount());
        if (o.comparison() == null) {
            return o.notCompared();
        }
        comparisons.add(o.comparison());
        return null;
    }

    /** The pairs of one wave whose two answers the variables' screens, on that wave's column tallies, both keep. */
    public static JointTally screened(JointTally t, ScreenedWave wave) {
        Exclusion ex = Exclusion.of(wave, t.x(), t.binning());
        Exclusion ey = Exclusion.of(wave, t.y(), t.binning());
        double[] xs = t.xs();
        double[] ys = t.ys();
        long[] n = t.counts();
        int kept = 0;
        for (int i = 0; i < n.length; i++) {
            if (!ex.excludes(xs[i]) && !ey.excludes(ys[i])) {
                xs[kept] = xs[i];
                ys[kept] = ys[i];
                n[kept] = n[i];
                kept++;
            }
        }
        return new JointTally(t.x(), t.y(), java.util.Arrays.copyOf(xs, kept), java.util.Arrays.copyOf(ys, kept),
                java.util.Arrays.copyOf(n, kept), t.binning());
    }

    /**
     * What one variable's screen leaves out, as numbers. Where the pairs or the column are summarised, a value is
     * left out when it shares a bin with an excluded value at the coarser of the two levels: the summary cannot tell
     * them apart (code-like values such as -9 or 999 are never binned, so they match exactly).
     */
    record Exclusion(Set<Double> values, int level, ValidNumber rule) {

        static Exclusion of(ScreenedWave wave, String column, Binning pairs) {
            int level = -1;
            Set<Double> values = new HashSet<>();
            ColumnTally tally = wave.tally(column);
            ScreenedVariable s = tally == null ? null : wave.get(column).orElse(null);
            if (s != null) {
                level = pairs.coarser(tally.binning()).level();
                List<String> out = new ArrayList<>(s.excludedValues());
                out.addAll(s.invalid().keySet());
                for (String text : out) {
                    Double d = ValidNumber.parse(text);
                    if (d != null) {
                        values.add(bin(d, level));
                    }
                }
            }
            return new Exclusion(values, level, wave.variable(column).map(ValidNumber::of).orElse(null));
        }

        boolean excludes(double x) {
            return (rule != null && rule.outside(x)) || values.contains(bin(x, level));
        }

        private static double bin(double x, int level) {
            return level < 0 ? (x == 0 ? 0.0 : x) : RelativeBins.binnedValue(x, level);
        }
    }
}
