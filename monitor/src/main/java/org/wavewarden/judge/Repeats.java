package org.wavewarden.judge;

import com.fasterxml.jackson.databind.JsonNode;
import org.wavewarden.compare.proportion.NewcombeDifference;
import org.wavewarden.deliver.Alerts;
import org.wavewarden.deliver.Json;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;

/**
 * Which findings worth a person repeat the previous wave's and so raise no new alert: a data-quality finding of the
 * same kind whose rate has not risen beyond its sampling error ("still present"), and a variable still too small to
 * resolve its threshold whose verdict has not changed ("still too few answers to judge").
 *
 * <p>A survey team stops reading a monitor that says the same thing every wave; a repeat stays in the findings (and
 * in the digest's sections) with a note saying since when, but asks for nobody's time again. What counts as "the
 * same thing" depends on the kind, see {@link Basis}.
 */
public final class Repeats {

    /** The confidence of the interval of the difference of two waves' rates that must hold zero (the usual 95%). */
    static final double CONFIDENCE = 0.95;

    private Repeats() {
    }

    /**
     * How a data-quality kind can repeat the previous wave's finding of the same variable and kind.
     */
    public enum Basis {
        /**
         * A level with a rate (rows of the kind among the wave's rows): still present unless it rose beyond its
         * sampling error, that is unless the 95% interval of the rise from the previous wave (Newcombe's hybrid score
         * interval, made of the two rates' Wilson intervals) lies above zero. A rate that fell is good news and, as a
         * rate that fell to zero is reported cleared rather than alerted, raises no new alert either: its note says
         * it fell. Checking only that the previous rate lies in the current rate's own interval would ignore the
         * previous wave's sampling error: between two waves of equal size a steady rate would re-alert about one
         * wave in six (|Z| > 1.96 / sqrt 2); a two-sided test of the change, one wave in twenty, as the demo's steady
         * 10% of blank occupations did in its last wave (10.3% then 8.9%); a rise alone, one wave in forty.
         * Disguised missing values of every kind, values outside the declared range, text in a numeric variable,
         * codebook missing codes.
         */
        RATE,
        /**
         * A state of the whole column with no rate to compare (every answer NULL, one value only, too many distinct
         * values to compare): still present when the previous wave reported the same state for the same column.
         */
        STATE,
        /**
         * Codes without a value label: still present when every code reported now was reported in the previous
         * wave; a code newly without a label is news.
         */
        CODES,
        /**
         * A change against the baseline, reported only when something moved between the two waves (a code that
         * appeared or vanished, a label that changed, heaping or digit preference that rose, a missing rate that
         * moved, a column added, dropped or retyped, an empty wave, a signed-off wave whose findings changed): each
         * one is news, never a repeat.
         */
        NEVER
    }

    /** How {@code kind} can repeat; SHIFT and the other judged kinds only repeat as still unresolvable. */
    public static Basis basis(FindingKind kind) {
        return switch (kind) {
            case BLANK, INVISIBLE, PLACEHOLDER, PATTERN_OUTLIER, NUMERIC_SENTINEL, OUT_OF_RANGE_SENTINEL,
                 TEXT_IN_NUMERIC, SENTINEL_DATE, INLIER_SPIKE, OUT_OF_RANGE, MISSING_CODE -> Basis.RATE;
            case ALL_NULL, CONSTANT, TOO_MANY_DISTINCT -> Basis.STATE;
            case CODE_UNLABELLED -> Basis.CODES;
            default -> Basis.NEVER;
        };
    }

    /**
     * @param previousWave     the wave compared against, null when there is none or it is pooled
     * @param previousFindings that wave's current findings (empty when none)
     * @param findings         this run's findings
     * @return the findings, repeats marked with {@link Finding#withRepeat} and their sentences saying so
     */
    public static List<Finding> mark(String previousWave, List<Finding> previousFindings, List<Finding> findings) {
        if (previousWave == null || previousFindings.isEmpty()) {
            return findings;
        }
        // One finding per variable and kind is the rule (a variable's missing rates are one finding with every
        // reason in its detail); should a kind ever give two, the first is the one compared.
        Map<Key, Finding> before = new LinkedHashMap<>();
        for (Finding p : previousFindings) {
            before.putIfAbsent(Key.of(p), p);
        }
        List<Finding> out = new ArrayList<>(findings.size());
        for (Finding f : findings) {
            Finding previous = before.get(Key.of(f));
            out.add(previous == null || !Alerts.worthAPerson(f) ? f : marked(previousWave, previous, f));
        }
        return out;
    }

    /**
     * What a finding must share with the previous wave's to repeat it: the variable, the kind and the rule of the
     * baseline it was judged against ({@link Against#rule}; null for the run's main baseline). The waves of a rule
     * move on with the judged wave, the rule does not: this quarter's finding against the same quarter last year
     * repeats last quarter's against its same quarter last year, never last quarter's against its previous wave.
     */
    private record Key(String variable, FindingKind kind, String rule) {
        static Key of(Finding f) {
            return new Key(f.variable(), f.kind(), Against.rule(f.against()));
        }
    }

    private static Finding marked(String previousWave, Finding previous, Finding f) {
        String firstWave = previous.repeat() != null ? previous.repeat().firstWave() : previousWave;
        if (stillUnresolvable(previous, f)) {
            Finding.Effect e = f.effect();
            return f.withRepeat(new Finding.Repeat(Finding.Repeat.Kind.STILL_UNRESOLVABLE, previousWave, firstWave))
                    .withSentence(f.sentence() + String.format(Locale.ROOT, " Too few answers to judge since wave"
                                    + " %s: the smallest change these waves could show (%.3g) is larger than the"
                                    + " threshold (%.3g), as in wave %s; no new alert.", firstWave,
                            e.minimumDetectable(), e.threshold(), previousWave));
        }
        if (f.verdict() == null && f.kind().isDataQuality() && stillPresent(previous, f)) {
            boolean fell = basis(f.kind()) == Basis.RATE && change(previous, f).upper() < 0;
            String since = " Still present since wave " + firstWave;
            return f.withRepeat(new Finding.Repeat(Finding.Repeat.Kind.STILL_PRESENT, previousWave, firstWave))
                    .withSentence(f.sentence() + since + (fell ? ": lower than in wave " + previousWave
                            + " (its rate fell beyond sampling error); no new alert." : ": unchanged from wave "
                            + previousWave + " (" + why(f.kind()) + "); no new alert."));
        }
        return f;
    }

    private static String why(FindingKind kind) {
        return switch (basis(kind)) {
            case RATE -> "its rate has not moved beyond sampling error";
            case CODES -> "the same codes";
            default -> "the same state";
        };
    }

    /**
     * UNCERTAIN now and before, and neither effect resolvable at its threshold: the variable is still too small to
     * judge. Anything else before (no verdict, another verdict, a resolvable effect) means its state changed.
     */
    static boolean stillUnresolvable(Finding previous, Finding f) {
        return f.verdict() == Verdict.UNCERTAIN && previous.verdict() == Verdict.UNCERTAIN && f.effect() != null
                && previous.effect() != null && !f.effect().resolvable() && !previous.effect().resolvable();
    }

    static boolean stillPresent(Finding previous, Finding f) {
        return switch (basis(f.kind())) {
            case RATE -> {
                if (Rate.of(f) == null || Rate.of(previous) == null) {
                    yield false;
                }
                yield change(previous, f).lower() <= 0;
            }
            case STATE -> true;
            case CODES -> {
                Set<String> was = codes(previous);
                Set<String> is = codes(f);
                yield !is.isEmpty() && was.containsAll(is);
            }
            case NEVER -> false;
        };
    }

    /** The 95% interval of the rise of a rate from the previous wave to this one; both rates must be usable. */
    private static NewcombeDifference change(Finding previous, Finding f) {
        Rate now = Rate.of(f);
        Rate then = Rate.of(previous);
        return NewcombeDifference.of(then.count(), then.rows(), now.count(), now.rows(), CONFIDENCE);
    }

    /**
     * A data-quality finding's rate: the rows of its kind ({@code count} of disguised values, {@code total} of
     * codes or unparsable text, {@code outside} the range) among the wave's {@code rows}, as its detail carries them
     * (a record in this run, the JSON object it was stored as in the previous run's). Null when the detail does not
     * hold a usable pair: such a finding is never a repeat.
     */
    record Rate(long count, long rows) {

        double share() {
            return (double) count / rows;
        }

        static Rate of(Finding f) {
            JsonNode d = tree(f);
            JsonNode rows = d.path("rows");
            JsonNode count = d.has("count") ? d.get("count") : d.has("total") ? d.get("total") : d.path("outside");
            if (!rows.canConvertToLong() || !count.canConvertToLong() || !rows.isIntegralNumber()
                    || !count.isIntegralNumber()) {
                return null;
            }
            long n = rows.asLong();
            long x = count.asLong();
            return n > 0 && x >= 0 && x <= n ? new Rate(x, n) : null;
        }
    }

    private static Set<String> codes(Finding f) {
        Set<String> out = new HashSet<>();
        tree(f).path("codes").forEach(c -> out.add(c.asText()));
        return out;
    }

    private static JsonNode tree(Finding f) {
        return f.detail() == null ? Json.mapper().createObjectNode() : Json.mapper().valueToTree(f.detail());
    }
}
