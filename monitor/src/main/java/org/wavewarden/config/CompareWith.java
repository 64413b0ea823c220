package org.wavewarden.config;

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

    CompareWith PREVIOUS = new Previous();
}
