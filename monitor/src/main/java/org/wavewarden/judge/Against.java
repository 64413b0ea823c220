package org.wavewarden.judge;

import org.wavewarden.config.CompareWith;

import java.util.List;

/**
 * How a finding names the baseline it was judged against when a dataset judges several alongside each other
 * ({@code compareWith: [previous, {sameWaveBack: 4}]}): the waves, then the rule in brackets, e.g.
 * {@code 2024-Q1 (4 waves back)}. The findings of the run's main baseline carry no name ({@link Finding#against} is
 * null), as every finding did before baselines could be judged alongside.
 *
 * <p>The waves change from one judged wave to the next, the rule does not: what repeats a finding of the previous
 * wave's run, and what keeps two alerts of one variable apart, is the rule ({@link #rule}).
 */
public final class Against {

    private Against() {
    }

    /** The name of a further baseline: its waves ({@link #waves(List)}) and the rule that chose them. */
    public static String label(List<String> waves, CompareWith rule) {
        return waves(waves) + " (" + ruleName(rule) + ")";
    }

    /** One wave as itself, several pooled ones by their first and last. */
    public static String waves(List<String> waves) {
        return waves.size() == 1 ? waves.get(0) : "pooled " + waves.get(0) + " .. " + waves.get(waves.size() - 1);
    }

    /** The rule in words, as a reader and a label say it. */
    public static String ruleName(CompareWith rule) {
        if (rule instanceof CompareWith.SameWaveBack s) {
            return s.waves() + (s.waves() == 1 ? " wave back" : " waves back");
        }
        if (rule instanceof CompareWith.PooledLast p) {
            return "last " + p.waves() + (p.waves() == 1 ? " wave" : " waves") + " pooled";
        }
        if (rule instanceof CompareWith.Baseline) {
            return "fixed baseline";
        }
        return "previous wave";
    }

    /**
     * The rule part of a finding's baseline name, which stays the same from wave to wave; null for the run's main
     * baseline. A name not made by {@link #label} is its own rule.
     */
    public static String rule(String against) {
        if (against == null) {
            return null;
        }
        int open = against.lastIndexOf(" (");
        return open >= 0 && against.endsWith(")") ? against.substring(open + 2, against.length() - 1) : against;
    }

    /** The waves part of a finding's baseline name; null for the run's main baseline. */
    public static String wavesOf(String against) {
        if (against == null) {
            return null;
        }
        int open = against.lastIndexOf(" (");
        return open >= 0 && against.endsWith(")") ? against.substring(0, open) : against;
    }

    /** The main baseline's part of a run's key ({@link #runLabel}); null and empty stay as they are. */
    public static String mainOf(String runLabel) {
        if (runLabel == null) {
            return null;
        }
        int plus = runLabel.indexOf(" + ");
        return plus < 0 ? runLabel : runLabel.substring(0, plus);
    }

    /** What a reader is told: "against 2024-Q1, 4 waves back"; empty for the run's main baseline. */
    public static String phrase(String against) {
        if (against == null) {
            return "";
        }
        String rule = rule(against);
        String waves = wavesOf(against);
        return rule.equals(waves) ? "against " + waves : "against " + waves + ", " + rule;
    }

    /**
     * The run's key for its baselines: the main baseline's name, then every further baseline's, e.g.
     * {@code 2024-Q4 + 2024-Q1 (4 waves back)}; null when the wave has no baseline at all.
     */
    public static String runLabel(String main, List<String> further) {
        if (main == null) {
            return null;
        }
        StringBuilder out = new StringBuilder(main);
        further.forEach(f -> out.append(" + ").append(f));
        return out.toString();
    }
}
