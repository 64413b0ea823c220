package org.wavewarden.config;

/**
 * What a dataset's waves observe. A sample stands for a population it did not fully observe, so its changes are
 * tested; a census or a full register observes every unit, so a change is as large as it is and is judged by its
 * size against the threshold alone, with no p-values, q-values or sampling intervals.
 */
public enum Population {
    SAMPLE, CENSUS, REGISTER;

    /** Every unit of the population is observed (a census or a full register). */
    public boolean complete() {
        return this != SAMPLE;
    }
}
