package org.wavewarden.config;

import java.util.List;

/** What a wave is compared against. */
public sealed interface CompareWith {

    /** The wave just before it in wave order (the default). */
    record Previous() implements CompareWith {
    }

    /** A fixed reference wave. */
    record Baseline(String wave) implements CompareWith {
    }

    /** The pooled answers of the last {@code waves} waves before it. */
    record PooledLast(int waves) implements CompareWith {
    }

    /**
     * The wave {@code waves} places before it in wave order: with quarterly waves and 4, the same quarter a year
     * earlier, so that seasonal answers are compared season with season. A wave with no wave that far back is
     * screened but not compared under this rule.
     */
    record SameWaveBack(int waves) implements CompareWith {
    }

    /**
     * Several rules judged alongside each other (for example the previous wave and the same quarter a year back):
     * each rule's comparisons are made and every finding names the baseline it used ({@code Finding.against}). The
     * first rule is the run's main baseline; none of the rules is itself {@code Alongside}.
     */
    record Alongside(List<CompareWith> rules) implements CompareWith {
        public Alongside {
            rules = List.copyOf(rules);
        }
    }

    CompareWith PREVIOUS = new Previous();

    /** The rules this one stands for: itself, or the rules judged alongside each other. */
    default List<CompareWith> rules() {
        return this instanceof Alongside a ? a.rules() : List.of(this);
    }
}
