package org.wavewarden.judge;

import org.wavewarden.compare.proportion.CohensH;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * Tells the reader of a shift when the answers it rests on thinned out: a shift computed on the 30% who answered
 * can reflect who stopped answering as much as what the answers are (informative missingness), so the SHIFT
 * sentence of a variable whose missing rate changed materially says how many rows had no valid answer in each wave.
 *
 * <p>A missing rate changed materially when the variable's MISSING_RATE_CHANGE finding is MATERIAL, or when the
 * share of rows without a valid answer (every missing reason together) moved by at least the threshold that
 * finding was judged against: Cohen's h of the two shares (Cohen 1988, chapter 6), or their difference when the
 * threshold is in points. The rows come from the MISSING_RATE_CHANGE finding (its n is the wave's rows), the valid
 * answers from the SHIFT finding's n, so every number the clause prints is in the two findings.
 */
public final class MissingRateContext {

    private MissingRateContext() {
    }

    /** The judged findings of one wave, with the missing-rate clause added to the SHIFT sentences that need it. */
    public static List<Finding> apply(List<Finding> findings) {
        Map<String, Finding> rates = new LinkedHashMap<>();
        for (Finding f : findings) {
            if (f.kind() == FindingKind.MISSING_RATE_CHANGE && f.nBaseline() != null && f.nCurrent() != null) {
                rates.putIfAbsent(f.variable(), f);
            }
        }
        List<Finding> out = new ArrayList<>(findings.size());
        for (Finding f : findings) {
            Finding rate = f.kind() == FindingKind.SHIFT ? rates.get(f.variable()) : null;
            String clause = rate == null ? null : clause(f, rate);
            out.add(clause == null ? f : f.withSentence(insert(f, clause)));
        }
        return out;
    }

    /** "; note that 2,100 of 3,000 rows (70.0%) have no valid answer ... who answered", or null when not needed. */
    static String clause(Finding shift, Finding rate) {
        if (shift.nBaseline() == null || shift.nCurrent() == null) {
            return null;
        }
        long rowsB = rate.nBaseline();
        long rowsC = rate.nCurrent();
        long validB = shift.nBaseline();
        long validC = shift.nCurrent();
        if (rowsB <= 0 || rowsC <= 0 || validB > rowsB || validC > rowsC) {
            return null; // the shift's n is not a count of rows (pairs, weights): nothing to relate
        }
        long missingB = rowsB - validB;
        long missingC = rowsC - validC;
        if (!(rate.verdict() == Verdict.MATERIAL || movedBeyondThreshold(missingB, rowsB, missingC, rowsC, rate))) {
            return null;
        }
        return String.format(Locale.ROOT, "; note that %,d of %,d rows (%.1f%%) have no valid answer this wave"
                        + " against %,d of %,d (%.1f%%) before, so the shift rests on the %,d rows (%.1f%%) that"
                        + " answered", missingC, rowsC, 100.0 * missingC / rowsC, missingB, rowsB,
                100.0 * missingB / rowsB, validC, 100.0 * validC / rowsC);
    }

    static boolean movedBeyondThreshold(long missingB, long rowsB, long missingC, long rowsC, Finding rate) {
        if (rate.effect() == null || !(rate.effect().threshold() > 0)) {
            return false;
        }
        double t = rate.effect().threshold();
        if (rate.effect().name().startsWith("Cohen's h")) {
            // Only the estimate is used; the confidence level shapes the interval alone.
            return Math.abs(CohensH.estimate(missingB, rowsB, missingC, rowsC, 0.95).estimate()) >= t;
        }
        return Math.abs((double) missingC / rowsC - (double) missingB / rowsB) >= t;
    }

    /** Before the closing ": VERDICT.", so that the verdict stays the sentence's last word. */
    static String insert(Finding f, String clause) {
        String tail = f.verdict() == null ? null : ": " + f.verdict().name() + ".";
        String s = f.sentence();
        int at = tail == null ? -1 : s.lastIndexOf(tail);
        return at < 0 ? s + " " + Character.toUpperCase(clause.charAt(2)) + clause.substring(3) + "."
                : s.substring(0, at) + clause + s.substring(at);
    }
}
