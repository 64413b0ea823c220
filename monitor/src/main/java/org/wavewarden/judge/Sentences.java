package org.wavewarden.judge;

import org.wavewarden.compare.Change;
import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.EffectSize;

import java.util.Locale;

/**
 * Writes the one plain sentence each finding carries, for a reader who is not a statistician: what moved and by
 * how much in the variable's own terms, how often chance alone would give a gap that large, and how the change
 * compares with the threshold that matters.
 */
public final class Sentences {

    private Sentences() {
    }

    /**
     * The sentence of a judged comparison.
     *
     * @param qValue     the comparison's q-value after false-discovery-rate control
     * @param familySize how many tests that control ran over (the run's family), so a reader can see why q exceeds p
     */
    public static String shift(Comparison c, double qValue, Verdict verdict, double alpha, int familySize) {
        Change ch = c.change();
        if (c.kind() == FindingKind.RELATIONSHIP_CHANGE) {
            return relationship(c, qValue, verdict, alpha, familySize);
        }
        if (c.detail() instanceof org.wavewarden.compare.DateComparison.DateDetail d) {
            return dates(c, d, qValue, verdict, alpha, familySize);
        }
        if (c.kind() == FindingKind.SHAPE_CHANGE) {
            return String.format(Locale.ROOT, "The shape of %s's distribution changed although its typical value did"
                            + " not: the %s is %.1f points (%d%% CI %.1f to %.1f; %s); %s: %s.",
                    c.variable(), ch.measure().replace(" of " + c.variable(), ""), ch.after() * 100,
                    Math.round(c.effect().confidence() * 100), ch.ciLow() * 100, ch.ciHigh() * 100, ch.note(),
                    chance(c.test().pValue(), qValue, familySize), verdict.name());
        }
        StringBuilder s = new StringBuilder();
        String measure = Character.toUpperCase(ch.measure().charAt(0)) + ch.measure().substring(1);
        double diff = ch.after() - ch.before();
        // The estimate is the plain difference unless the comparison names another shift (Hodges-Lehmann, the
        // median of paired changes); rounding of after - before must not turn the one into the other.
        boolean namedShift = ch.note().startsWith(SHIFT_NOTE);
        boolean plainDifference = !namedShift && Math.abs(ch.estimate() - diff) <= 1e-9 * Math.max(1, Math.abs(diff));
        String shiftName = plainDifference ? "" : shiftName(ch.note());
        int digits = Math.max(decimals(ch.before()), Math.min(3, decimals(ch.estimate())));
        String before = value(ch, ch.before(), digits);
        String after = value(ch, ch.after(), digits);
        String unit = ch.percent() ? "" : unitSuffix(ch);
        boolean missingRate = c.kind() == FindingKind.MISSING_RATE_CHANGE && ch.percent();
        // A direction word must agree with every change the sentence prints: with a named shift beside the two
        // values, it is used only when both point the same way.
        int printedMove = Double.compare(Double.parseDouble(after.replace("%", "")),
                Double.parseDouble(before.replace("%", "")));
        int shiftSign = (int) Math.signum(Double.parseDouble(signed(ch, ch.estimate())));
        s.append(measure).append(' ');
        if (printedMove == 0) {
            s.append("stayed at ").append(after);
        } else if (plainDifference || printedMove == shiftSign) {
            s.append(printedMove > 0 ? "rose" : "fell").append(" from ").append(before).append(" to ").append(after);
        } else {
            s.append("went from ").append(before).append(" to ").append(after);
        }
        s.append(missingRate ? " of rows" + (printedMove == 0 ? "" : ratio(ch)) : unit);
        if (!plainDifference && printedMove == 0 && shiftSign != 0) {
            s.append(", but the answers as a whole moved");
        }
        // A plain difference without an interval is the two values' difference and adds nothing to read.
        boolean estimateShown = !plainDifference || !Double.isNaN(ch.ciLow());
        String note = otherNote(ch.note());
        if (estimateShown || !note.isEmpty()) {
            s.append(" (");
        }
        if (estimateShown) {
            if (!shiftName.isEmpty()) {
                s.append(shiftName).append(' ');
            }
            s.append(signed(ch, ch.estimate()));
            if (missingRate) {
                s.append(" points");
            }
            if (!Double.isNaN(ch.ciLow())) {
                s.append(", ").append(Math.round(c.effect().confidence() * 100)).append("% CI ")
                        .append(signed(ch, ch.ciLow())).append(" to ").append(signed(ch, ch.ciHigh()));
            }
            if (!missingRate) {
                s.append(ch.percent() ? " points" : unitSuffix(ch));
            }
            if (shiftName.equals(HODGES_LEHMANN)) {
                s.append(", the typical difference between answers of the two waves");
            }
        }
        if (!note.isEmpty()) {
            s.append(estimateShown ? "; " : "").append(note);
        }
        s.append(estimateShown || !note.isEmpty() ? "); " : "; ");
        s.append(chance(c.test().pValue(), qValue, familySize));
        s.append("; ").append(c.effect().name()).append(' ').append(num(c.effect().estimate(), 3));
        // Cohen's conventions describe differences between groups; for a missing rate the ratio and the points
        // above say how large the change is, and "small" would understate a six-fold rise.
        String word = missingRate ? "" : org.wavewarden.compare.Magnitude.of(c.effect().name(), c.effect().estimate());
        if (!word.isEmpty()) {
            s.append(" (").append(word).append(", ").append(magnitudeSource(c.effect().name())).append(')');
        }
        boolean beyond = Math.abs(c.effect().estimate()) >= c.threshold();
        s.append(beyond ? ", at or above" : ", below").append(" the ").append(thresholdText(c)).append(" threshold");
        s.append(intervalClause(c, beyond, verdict, qValue, alpha, true));
        s.append(": ").append(verdict.name()).append('.');
        return s.toString();
    }

    /**
     * "Too few answers to judge: with 34 and 31 answers, these waves can only show changes of at least 0.50
     * (Hedges' g); the threshold 0.2 cannot be resolved at this sample size." Said of an UNCERTAIN comparison whose
     * interval is too wide to fit inside the threshold's band ({@link Finding.Effect#resolvable()}), in the units
     * the threshold is stated in.
     */
    public static String tooFewAnswers(Comparison c, Finding.Effect e) {
        String threshold = thresholdText(c);
        String mde;
        if (c.thresholdSource().endsWith(" percentage points")) {
            mde = atLeast(100 * e.minimumDetectable(), 100 * e.threshold(), 1) + " percentage points";
        } else {
            String v = atLeast(e.minimumDetectable(), e.threshold(), Math.max(2, decimals(e.minimumDetectable()) - 1));
            boolean configuredRaw = c.thresholdSource().startsWith("configured ")
                    && !c.thresholdSource().contains(" on ");
            String unit = configuredRaw && threshold.contains(" ") ? threshold.substring(threshold.indexOf(' ')) : "";
            mde = v + unit + " (" + e.name() + ")";
        }
        if (c.kind() == FindingKind.REFERENCE) {
            // A reference is a fixed value, not a second wave: only the current wave's answers count.
            return String.format(Locale.ROOT, "Too few answers to judge: with %,d answers, this wave can only show"
                    + " differences from the reference of at least %s; the threshold %s cannot be resolved at this"
                    + " sample size.", c.nCurrent(), mde, threshold);
        }
        return String.format(Locale.ROOT, "Too few answers to judge: with %,d and %,d answers, these waves can only"
                + " show changes of at least %s; the threshold %s cannot be resolved at this sample size.",
                c.nBaseline(), c.nCurrent(), mde, threshold);
    }

    /**
     * v with at least {@code digits} decimals, more where fewer would print it at or below the threshold it exceeds
     * (an MDE of 0.2004 against 0.2 reads "0.2004", never "0.20").
     */
    private static String atLeast(double v, double threshold, int digits) {
        int d = digits;
        while (d < 8 && v > threshold && Double.parseDouble(num(v, d)) <= threshold) {
            d++;
        }
        return num(v, d);
    }

    /**
     * The sentence of a comparison in a complete enumeration, judged by size alone: "Every unit was observed
     * (census): the change is as large as it is, so no test is made; mean of income rose from 2,000 to 2,100 (+100);
     * Hedges' g 0.25, at or above the 0.2 threshold: MATERIAL." A missing rate says that its shares are of every
     * unit, those who did not answer included, since in a complete enumeration nonresponse is missingness and not
     * a sample's chance.
     */
    public static String bySize(Comparison c, Verdict verdict, org.wavewarden.config.Population population) {
        Change ch = c.change();
        boolean missingRate = c.kind() == FindingKind.MISSING_RATE_CHANGE && ch.percent();
        StringBuilder s = new StringBuilder("Every unit was observed (")
                .append(population == org.wavewarden.config.Population.REGISTER ? "full register" : "census")
                .append("): the change is as large as it is, so no test is made");
        if (missingRate) {
            s.append(", and the shares are of all units, those that did not answer included");
        }
        s.append("; ");
        String measure = c.kind() == FindingKind.RELATIONSHIP_CHANGE ? "the Spearman correlation of "
                + ch.measure().replaceFirst("^Spearman rho of ", "") : ch.measure();
        int digits = Math.max(decimals(ch.before()), Math.min(3, decimals(ch.estimate())));
        String before = value(ch, ch.before(), digits);
        String after = value(ch, ch.after(), digits);
        s.append(measure).append(' ');
        if (before.equals(after)) {
            s.append("stayed at ").append(after);
        } else {
            s.append(ch.after() > ch.before() ? "rose" : "fell").append(" from ").append(before).append(" to ")
                    .append(after);
        }
        s.append(missingRate ? " of units" : ch.percent() ? "" : unitSuffix(ch));
        s.append(" (").append(signed(ch, ch.estimate())).append(ch.percent() ? " points" : unitSuffix(ch))
                .append("); ");
        s.append(c.effect().name()).append(' ').append(num(c.effect().estimate(), 3));
        boolean beyond = Math.abs(c.effect().estimate()) >= c.threshold();
        s.append(beyond ? ", at or above" : c.effect().estimate() == 0 ? ", no change against" : ", below")
                .append(" the ").append(thresholdText(c)).append(" threshold");
        s.append(": ").append(verdict.name()).append('.');
        return s.toString();
    }

    /**
     * "Cleared: the share missing (999) fell from 2.7% of rows to none this wave (-2.7 points); nothing is left to
     * look at: CLEARED." A missing reason or sentinel that is gone is good news, not a change to look at.
     */
    public static String cleared(String measure, double shareBefore) {
        return String.format(Locale.ROOT, "Cleared: the %s fell from %.1f%% of rows to none this wave (%+.1f points);"
                + " nothing is left to look at: %s.", measure, 100 * shareBefore, -100 * shareBefore,
                Verdict.CLEARED.name());
    }

    /** The name Sentences gives the Hodges-Lehmann estimate beside two medians. */
    static final String HODGES_LEHMANN = "Hodges-Lehmann shift";
    /** A comparison whose change is a named shift says so in its note: "the shift is the ...". */
    static final String SHIFT_NOTE = "the shift is the ";

    static String shiftName(String note) {
        String first = note.split("; ", 2)[0];
        if (!first.startsWith(SHIFT_NOTE)) {
            return "shift";
        }
        String name = first.substring(SHIFT_NOTE.length());
        return name.equals("Hodges-Lehmann estimate") ? HODGES_LEHMANN : name;
    }

    static String otherNote(String note) {
        return note.startsWith(SHIFT_NOTE) ? note.contains("; ") ? note.split("; ", 2)[1] : "" : note;
    }

    /** ", 6.6 times as many": the current share over the baseline share, to two significant digits. */
    static String ratio(Change ch) {
        double b = ch.before();
        double a = ch.after();
        if (b == 0 && a > 0) {
            return ", where the baseline had none";
        }
        if (a == 0 && b > 0) {
            return ", none this wave";
        }
        if (b == 0) {
            return "";
        }
        String r = String.format(Locale.ROOT, "%.2g", a / b);
        return Double.parseDouble(r) == 1 ? "" : ", " + r + " times as many";
    }

    /** Where the magnitude words of {@link org.wavewarden.compare.Magnitude} come from, named beside the word. */
    static String magnitudeSource(String effectName) {
        return effectName.toLowerCase(Locale.ROOT).startsWith("cliff") ? "Romano et al. 2006" : "Cohen 1988";
    }

    /**
     * The clause that reads the interval against the threshold, derived from the interval as printed: the limits
     * are printed with as many decimals as it takes for the printed numbers to show what the verdict saw.
     */
    static String intervalClause(Comparison c, boolean estimateBeyond, Verdict verdict, double qValue, double alpha,
                                 boolean printInterval) {
        if (verdict != Verdict.UNCERTAIN && verdict != Verdict.STABLE) {
            return "";
        }
        if (verdict == Verdict.UNCERTAIN && VerdictRule.overruledByShownInterval(qValue, c, alpha)) {
            return disagreementClause(c, printInterval);
        }
        double t = c.threshold();
        double lo = c.effect().ciLow();
        double hi = c.effect().ciHigh();
        int d = 3;
        while (d < 8 && (verdict == Verdict.STABLE) != inside(round(lo, d), round(hi, d), t)) {
            d++;
        }
        double l = round(lo, d);
        double h = round(hi, d);
        String interval = printInterval ? "the interval (" + num(lo, d) + " to " + num(hi, d) + ")" : "its interval";
        if (verdict == Verdict.STABLE) {
            return ", and " + interval + " rules out a change that large";
        }
        if (l >= t || h <= -t) {
            return ", and so does " + (printInterval ? "all of " + interval : "all of its interval")
                    + ", but the test cannot tell it from chance (" + q(qValue) + ", not below "
                    + alpha + ")";
        }
        return estimateBeyond ? ", but " + interval + " also holds changes smaller than that"
                : ", but " + interval + " reaches it";
    }

    /**
     * Why a share whose test and threshold would have settled it is UNCERTAIN: its effect's interval and the
     * interval of the difference in points disagree on whether it changed at all ({@link VerdictRule}). Both
     * intervals are printed with as many decimals as it takes for each to show on which side of zero it ends.
     */
    static String disagreementClause(Comparison c, boolean printInterval) {
        EffectSize effect = c.effect();
        EffectSize shown = VerdictRule.shownShareDifference(c);
        boolean effectIncludes = VerdictRule.includesZero(effect);
        String own = printInterval ? "its interval (" + zeroFaithful(effect.ciLow(), 3, "") + " to "
                + zeroFaithful(effect.ciHigh(), 3, "") + ")" : "its interval";
        return ", but " + own + (effectIncludes ? " includes" : " excludes") + " no change while the interval of"
                + " the difference in points (" + zeroFaithful(shown.ciLow() * 100, 1, "+") + " to "
                + zeroFaithful(shown.ciHigh() * 100, 1, "+") + ")" + (effectIncludes ? " excludes" : " includes")
                + " it; the two intervals disagree on whether the share changed at all, so the change is called"
                + " neither MATERIAL nor STABLE";
    }

    /** v with at least {@code digits} decimals, more where fewer would print a non-zero limit as 0 or -0. */
    private static String zeroFaithful(double v, int digits, String plus) {
        int d = digits;
        while (d < 8 && v != 0 && Double.parseDouble(num(v, d)) == 0) {
            d++;
        }
        return (v >= 0 ? plus : "") + num(v, d);
    }

    private static boolean inside(double lo, double hi, double t) {
        return lo > -t && hi < t;
    }

    private static double round(double v, int digits) {
        return Double.parseDouble(num(v, digits));
    }

    /**
     * "The Spearman correlation of hours and income fell from 0.612 to 0.204 (difference -0.408, 95% CI -0.452 to
     * -0.362; Pearson r 0.598 to 0.201); chance alone ...; the difference is at or above the 0.1 threshold: MATERIAL."
     */
    static String relationship(Comparison c, double qValue, Verdict verdict, double alpha, int familySize) {
        Change ch = c.change();
        String pair = ch.measure().replaceFirst("^Spearman rho of ", "");
        double diff = ch.after() - ch.before();
        StringBuilder s = new StringBuilder("The Spearman correlation of ").append(pair).append(' ');
        if (diff == 0) {
            s.append("stayed at ").append(num(ch.after(), 3));
        } else {
            s.append(diff > 0 ? "rose" : "fell").append(" from ").append(num(ch.before(), 3)).append(" to ")
                    .append(num(ch.after(), 3));
        }
        s.append(" (difference ").append(signed3(ch.estimate())).append(", ")
                .append(Math.round(c.effect().confidence() * 100)).append("% CI ").append(signed3(ch.ciLow()))
                .append(" to ").append(signed3(ch.ciHigh()));
        if (!ch.note().isEmpty()) {
            s.append("; ").append(ch.note());
        }
        s.append("); ").append(chance(c.test().pValue(), qValue, familySize)).append("; the difference is");
        boolean beyond = Math.abs(c.effect().estimate()) >= c.threshold();
        s.append(beyond ? " at or above" : " below").append(" the ").append(thresholdText(c)).append(" threshold");
        s.append(intervalClause(c, beyond, verdict, qValue, alpha, false));
        s.append(": ").append(verdict.name()).append('.');
        if (c.detail() instanceof org.wavewarden.compare.relation.RelationshipDetail d && d.relativeError() > 0) {
            s.append(String.format(Locale.ROOT, " The pairs have more distinct values than are counted exactly, so"
                    + " they were summarised in bins: each value stands within %.2g%% of the one it replaces, and"
                    + " values sharing a bin count as ties.", 100 * d.relativeError()));
        }
        return s.toString();
    }

    /**
     * "The median date of visit_date moved from 2024-03-02 to 2024-05-10 (+69 days; 95% CI 2024-02-20 to 2024-03-15
     * and 2024-05-01 to 2024-05-20); 22.1% of this wave's dates lie outside the baseline's span 2023-01-01 to
     * 2023-12-31; p = ...; KS distance 0.277 (95% CI 0.210 to 0.344), at or above the 0.1 threshold: MATERIAL." Every
     * date and number is a field of the finding's {@code DateDetail} or its effect; a date has no mean, and the
     * verdict is on the distance between the two waves' distributions of dates, which the sentence names last.
     */
    static String dates(Comparison c, org.wavewarden.compare.DateComparison.DateDetail d, double qValue,
                        Verdict verdict, double alpha, int familySize) {
        StringBuilder s = new StringBuilder("The median date of ").append(c.variable()).append(' ');
        long level = Math.round(c.effect().confidence() * 100);
        if (d.medianBaseline().equals(d.medianCurrent())) {
            s.append("stayed at ").append(d.medianCurrent()).append(" (");
        } else {
            double days = d.medianShiftDays();
            s.append("moved from ").append(d.medianBaseline()).append(" to ").append(d.medianCurrent()).append(" (")
                    .append(days == Math.rint(days) ? String.format(Locale.ROOT, "%+d", (long) days)
                            : String.format(Locale.ROOT, "%+.2f", days))
                    .append(Math.abs(days) == 1 ? " day" : " days").append("; ");
        }
        String lowB = org.wavewarden.compare.DateComparison.DateDetail.date(d.medianBaselineInterval().ciLow());
        String lowC = org.wavewarden.compare.DateComparison.DateDetail.date(d.medianCurrentInterval().ciLow());
        if (lowB != null && lowC != null) {
            s.append(level).append("% CI of the medians ").append(lowB).append(" to ")
                    .append(org.wavewarden.compare.DateComparison.DateDetail.date(d.medianBaselineInterval().ciHigh()))
                    .append(" and ").append(lowC).append(" to ")
                    .append(org.wavewarden.compare.DateComparison.DateDetail.date(d.medianCurrentInterval().ciHigh()));
        } else {
            s.append("too few dates for an interval of the medians");
        }
        s.append(String.format(Locale.ROOT, "); %.1f%% of this wave's dates lie outside the baseline's span %s to %s;"
                        + " ", 100 * d.shareOutsideBaselineSpan(), d.earliestBaseline(), d.latestBaseline()));
        s.append(chance(c.test().pValue(), qValue, familySize));
        s.append("; ").append(c.effect().name()).append(' ').append(num(c.effect().estimate(), 3)).append(" (")
                .append(level).append("% CI ").append(num(c.effect().ciLow(), 3)).append(" to ")
                .append(num(c.effect().ciHigh(), 3)).append(')');
        boolean beyond = Math.abs(c.effect().estimate()) >= c.threshold();
        s.append(beyond ? ", at or above" : ", below").append(" the ").append(thresholdText(c)).append(" threshold");
        s.append(intervalClause(c, beyond, verdict, qValue, alpha, false));
        s.append(": ").append(verdict.name()).append('.');
        return s.toString();
    }

    private static String signed3(double d) {
        return (d >= 0 ? "+" : "") + num(d, 3);
    }

    /**
     * "p = 0.14: chance alone would give a gap this large in about 1 in 7 comparisons; after false-discovery control
     * over the 40 tests of this run, q = 0.3055". The "1 in N" is read from p, which is printed beside it; q is the
     * p-value adjusted over the whole family, whose size is printed so that q above p needs no explaining.
     */
    public static String chance(double p, double qValue, int familySize) {
        return p(p) + ": " + chance(p) + "; after false-discovery control over " + (familySize == 1
                ? "the single test of this run" : String.format(Locale.ROOT, "the %,d tests of this run", familySize))
                + ", " + q(qValue);
    }

    /** "chance alone would give a gap this large in fewer than 1 in 1,000 comparisons", read from p. */
    public static String chance(double p) {
        if (p < 0.001) {
            return "chance alone would give a gap this large in fewer than 1 in 1,000 comparisons";
        }
        if (p >= 0.5) {
            return "a gap this large is what chance alone gives in about half of all comparisons or more";
        }
        long oneIn = Math.max(2, Math.round(1 / p));
        return "chance alone would give a gap this large in about 1 in " + String.format(Locale.ROOT, "%,d", oneIn)
                + " comparisons";
    }

    /** p to two significant digits ("p = 0.14", "p = 0.0021"), or "p < 0.001". */
    static String p(double p) {
        return p < 0.001 ? "p < 0.001" : "p = " + String.format(Locale.ROOT, "%.2g", p);
    }

    static String thresholdText(Comparison c) {
        String src = c.thresholdSource();
        return src.startsWith("configured ") ? src.substring("configured ".length()).replaceFirst(" on .*", "")
                : num(c.threshold(), 3);
    }

    static String value(Change ch, double v, int digits) {
        return ch.percent() ? String.format(Locale.ROOT, "%.1f%%", v * 100) : num(v, digits);
    }

    static String signed(Change ch, double d) {
        return ch.percent() ? String.format(Locale.ROOT, "%+.1f", d * 100) : (d >= 0 ? "+" : "") + num(d, decimals(d));
    }

    static String unitSuffix(Change ch) {
        return ch.unit() == null ? "" : " " + ch.unit();
    }

    static int decimals(double v) {
        double a = Math.abs(v);
        return a >= 100 ? 0 : a >= 10 ? 1 : a >= 1 ? 2 : 3;
    }

    static String num(double v, int digits) {
        // Beyond 1e15 the digits of a double are not the answer's any more, and 1e308 would print 309 of them.
        if (Math.abs(v) >= 1e15 && Double.isFinite(v)) {
            return String.format(Locale.ROOT, "%.4g", v);
        }
        return String.format(Locale.ROOT, "%." + digits + "f", v);
    }

    static String q(double q) {
        return q < 0.0001 ? "q < 0.0001" : String.format(Locale.ROOT, "q = %.4f", q);
    }
}
