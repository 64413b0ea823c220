package org.wavewarden.judge;

import org.wavewarden.compare.Change;
import org.wavewarden.compare.Comparison;

import java.util.Locale;

/**
 * Writes the one plain sentence each finding carries, for a reader who is not a statistician: what moved and by
 * how much in the variable's own terms, how often chance alone would give a gap that large, and how the change
 * compares with the threshold that matters.
 */
public final class Sentences {

    private Sentences() {
    }

    public static String shift(Comparison c, double qValue, Verdict verdict, double alpha) {
        Change ch = c.change();
        if (c.kind() == FindingKind.RELATIONSHIP_CHANGE) {
            return relationship(c, qValue, verdict);
        }
        if (c.kind() == FindingKind.SHAPE_CHANGE) {
            return String.format(Locale.ROOT, "The shape of %s's distribution changed although its typical value did"
                            + " not: the %s is %.1f points (%d%% CI %.1f to %.1f; %s); %s (q = %s): %s.",
                    c.variable(), ch.measure().replace(" of " + c.variable(), ""), ch.after() * 100,
                    Math.round(c.effect().confidence() * 100), ch.ciLow() * 100, ch.ciHigh() * 100, ch.note(),
                    chance(c.test().pValue()), q(qValue), verdict.name());
        }
        StringBuilder s = new StringBuilder();
        String measure = Character.toUpperCase(ch.measure().charAt(0)) + ch.measure().substring(1);
        double diff = ch.after() - ch.before();
        int digits = Math.max(decimals(ch.before()), Math.min(3, decimals(ch.estimate())));
        String direction = diff > 0 ? "rose" : diff < 0 ? "fell" : "stayed";
        s.append(measure).append(' ').append(direction).append(" from ").append(value(ch, ch.before(), digits))
                .append(" to ").append(value(ch, ch.after(), digits)).append(ch.percent() ? "" : unitSuffix(ch));
        s.append(" (").append(ch.estimate() == diff ? "" : "shift ").append(signed(ch, ch.estimate()));
        if (!Double.isNaN(ch.ciLow())) {
            s.append(", ").append(Math.round(c.effect().confidence() * 100)).append("% CI ")
                    .append(signed(ch, ch.ciLow())).append(" to ").append(signed(ch, ch.ciHigh()));
        }
        s.append(ch.percent() ? " points" : unitSuffix(ch));
        if (!ch.note().isEmpty()) {
            s.append("; ").append(ch.note());
        }
        s.append("); ");
        s.append(chance(c.test().pValue())).append(" (").append(q(qValue)).append(")");
        s.append("; ").append(c.effect().name()).append(' ').append(num(c.effect().estimate(), 3));
        String word = org.wavewarden.compare.Magnitude.of(c.effect().name(), c.effect().estimate());
        if (!word.isEmpty()) {
            s.append(" (").append(word).append(')');
        }
        boolean beyond = Math.abs(c.effect().estimate()) >= c.threshold();
        s.append(beyond ? ", at or above" : ", below").append(" the ").append(thresholdText(c)).append(" threshold");
        if (verdict == Verdict.UNCERTAIN) {
            s.append(", but the interval (").append(num(c.effect().ciLow(), 3)).append(" to ")
                    .append(num(c.effect().ciHigh(), 3)).append(") still reaches it");
        } else if (verdict == Verdict.STABLE) {
            s.append(", and the interval (").append(num(c.effect().ciLow(), 3)).append(" to ")
                    .append(num(c.effect().ciHigh(), 3)).append(") rules out a change that large");
        }
        s.append(": ").append(verdict.name()).append('.');
        return s.toString();
    }

    /**
     * "The Spearman correlation of hours and income fell from 0.612 to 0.204 (difference -0.408, 95% CI -0.452 to
     * -0.362; Pearson r 0.598 to 0.201); chance alone ...; the difference is at or above the 0.1 threshold: MATERIAL."
     */
    static String relationship(Comparison c, double qValue, Verdict verdict) {
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
        s.append("); ").append(chance(c.test().pValue())).append(" (").append(q(qValue)).append("); the difference is");
        boolean beyond = Math.abs(c.effect().estimate()) >= c.threshold();
        s.append(beyond ? " at or above" : " below").append(" the ").append(thresholdText(c)).append(" threshold");
        if (verdict == Verdict.UNCERTAIN) {
            s.append(", but its interval still reaches it");
        } else if (verdict == Verdict.STABLE) {
            s.append(", and its interval rules out a change that large");
        }
        s.append(": ").append(verdict.name()).append('.');
        if (c.detail() instanceof org.wavewarden.compare.relation.RelationshipDetail d && d.relativeError() > 0) {
            s.append(String.format(Locale.ROOT, " The pairs have more distinct values than are counted exactly, so"
                    + " they were summarised in bins: each value stands within %.2g%% of the one it replaces, and"
                    + " values sharing a bin count as ties.", 100 * d.relativeError()));
        }
        return s.toString();
    }

    private static String signed3(double d) {
        return (d >= 0 ? "+" : "") + num(d, 3);
    }

    /** "chance alone would give a gap this large in fewer than 1 in 1,000 comparisons". */
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
