package org.wavewarden.compare.relation;

import org.wavewarden.compare.Change;
import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.TestResult;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.profile.JointTally;

/**
 * Compares how strongly two variables go together in two independent waves, from their joint tallies: Spearman's
 * rho in each wave ({@link Correlation}, primary, since survey answers are rarely bivariate normal and often
 * heavily tied), the difference rho_current - rho_baseline with Fisher's z test and Zou's (2007) interval
 * ({@link CorrelationDifference}), and Pearson's r with its own test in the detail. The verdict is then taken on the
 * difference of rhos against a threshold on that scale, as for any shift.
 */
public final class RelationshipChange {

    private RelationshipChange() {
    }

    /** Either a comparison, or the reason the two waves' correlations cannot be compared. */
    public record Outcome(Comparison comparison, String notCompared) {

        static Outcome skipped(String why) {
            return new Outcome(null, why);
        }
    }

    /**
     * @param variable        the name findings carry, e.g. {@code x ~ y}
     * @param baseline        the baseline wave's pairs, already rid of missing values
     * @param current         the current wave's pairs, likewise
     * @param threshold       the difference of Spearman correlations that matters, positive
     * @param thresholdSource where the threshold came from, e.g. "configured 0.15 on ..."
     * @param confidence      level of every interval, in (0, 1)
     * @param screenedBaseline baseline pairs the caller left out as missing, for the detail
     * @param screenedCurrent  current pairs left out as missing
     */
    public static Outcome compare(String variable, JointTally baseline, JointTally current, double threshold,
                                  String thresholdSource, double confidence, long screenedBaseline,
                                  long screenedCurrent) {
        String why = whyNot(baseline, "baseline");
        if (why == null) {
            why = whyNot(current, "current");
        }
        if (why != null) {
            return Outcome.skipped(why);
        }
        CorrelationResult sb = Correlation.spearman(baseline.xs(), baseline.ys(), baseline.counts(), confidence);
        CorrelationResult sc = Correlation.spearman(current.xs(), current.ys(), current.counts(), confidence);
        if (Math.abs(sb.estimate()) == 1 || Math.abs(sc.estimate()) == 1) {
            return Outcome.skipped("the ranks of " + baseline.x() + " and " + baseline.y() + " agree perfectly in the "
                    + (Math.abs(sb.estimate()) == 1 ? "baseline" : "current") + " wave (Spearman rho "
                    + (Math.abs(sb.estimate()) == 1 ? sb.estimate() : sc.estimate()) + "), where Fisher's z is"
                    + " infinite");
        }
        CorrelationResult pb = Correlation.pearson(baseline.xs(), baseline.ys(), baseline.counts(), confidence);
        CorrelationResult pc = Correlation.pearson(current.xs(), current.ys(), current.counts(), confidence);
        CorrelationDifferenceResult spearman = CorrelationDifference.compare(sb, sc, confidence);
        CorrelationDifferenceResult pearson = Math.abs(pb.estimate()) < 1 && Math.abs(pc.estimate()) < 1
                ? CorrelationDifference.compare(pb, pc, confidence) : null;
        double error = Math.max(baseline.binning().relativeError(), current.binning().relativeError());
        TestResult test = TestResult.withoutDf("Fisher z (" + CorrelationMethod.SPEARMAN.label() + ")", spearman.z(),
                spearman.pValue());
        EffectSize effect = new EffectSize("difference of Spearman rho", spearman.difference(), spearman.ciLow(),
                spearman.ciHigh(), confidence);
        Change change = new Change("Spearman rho of " + baseline.x() + " and " + baseline.y(), sb.estimate(),
                sc.estimate(), false, null, spearman.difference(), spearman.ciLow(), spearman.ciHigh(),
                String.format(java.util.Locale.ROOT, "Pearson r %.3f to %.3f", pb.estimate(), pc.estimate()));
        RelationshipDetail detail = new RelationshipDetail(baseline.x(), baseline.y(), sb, sc, pb, pc, pearson,
                screenedBaseline, screenedCurrent, error);
        return new Outcome(new Comparison(variable, FindingKind.RELATIONSHIP_CHANGE, test, effect, threshold,
                thresholdSource, sb.n(), sc.n(), change, detail), null);
    }

    /** Why one wave's pairs give no correlation with a Fisher-z variance, or null when they do. */
    static String whyNot(JointTally t, String wave) {
        long n = t.pairCount();
        if (n < 4) {
            return "fewer than 4 pairs with both answers in the " + wave + " wave (" + n + ")";
        }
        for (boolean first : new boolean[] {true, false}) {
            double[] v = first ? t.xs() : t.ys();
            boolean constant = true;
            for (double d : v) {
                constant &= d == v[0];
            }
            if (constant) {
                return (first ? t.x() : t.y()) + " takes a single value in the " + wave + " wave's pairs";
            }
        }
        return null;
    }
}
