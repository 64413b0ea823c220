package org.wavewarden.config;

import java.util.List;

/**
 * One survey dataset: where its waves live and how each variable is judged.
 *
 * @param name         label used in outputs and alert keys
 * @param table        {@code schema.table} holding every wave, with {@code waveColumn} naming the wave
 * @param waveColumn   column that names the wave of each row
 * @param tablePattern alternative to {@code table}: one table per wave, e.g. {@code survey.wave_{wave}}
 * @param waveOrder    order of waves
 * @param compareWith  what each wave is compared against
 * @param schedule     Quartz cron expression for the daemon; optional
 * @param exclude      columns never monitored (keys, free identifiers)
 * @param variables    declared variables; others are inferred
 */
public record DatasetConfig(String name, String table, String waveColumn, String tablePattern, WaveOrder waveOrder,
                            CompareWith compareWith, String schedule, List<String> exclude,
                            List<VariableConfig> variables) {

    public DatasetConfig {
        waveOrder = waveOrder == null ? WaveOrder.NATURAL : waveOrder;
        compareWith = compareWith == null ? CompareWith.PREVIOUS : compareWith;
        exclude = exclude == null ? List.of() : List.copyOf(exclude);
        variables = variables == null ? List.of() : List.copyOf(variables);
    }
}
