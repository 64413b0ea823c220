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
 * @param quietPeriod  the daemon judges a wave once its row count has been unchanged this long (zero: at once)
 * @param alerts       where the daemon delivers this dataset's alerts besides the alerts table
 * @param readyTable   optional {@code schema.table} whose {@code readyColumn} lists the waves released for judging;
 *                     when set, a wave not listed there is not judged however long its count has been stable
 * @param readyColumn  the column of {@code readyTable} holding wave labels
 * @param weightColumn optional survey weight column: never compared itself, its sums per value are kept in each
 *                     wave's summary
 * @param respondentKey optional column identifying a respondent across waves and releases; never compared as a
 *                     variable; with it, respondents in both waves are also compared paired
 * @param releases     optional: where earlier publications of a wave are kept (needs {@code respondentKey})
 * @param design       optional strata and cluster columns of the sampling design (needs {@code weightColumn})
 * @param relationships pairs of numeric variables whose correlation is compared between waves
 * @param codebook     optional codebook file whose variables are merged with {@code variables} (the YAML wins)
 * @param population   a sample (the default), or a census or full register judged by the size of change alone
 * @param alertRules   changes expected ahead and mute rules
 * @param breakdowns   domain columns flagged variables are broken down by, and interviewer monitoring
 */
public record DatasetConfig(String name, String table, String waveColumn, String tablePattern, WaveOrder waveOrder,
                            CompareWith compareWith, String schedule, List<String> exclude,
                            List<VariableConfig> variables, java.time.Duration quietPeriod, SinkSettings alerts,
                            String readyTable, String readyColumn, String weightColumn, String respondentKey,
                            ReleasesConfig releases, DesignColumns design, List<RelationshipConfig> relationships,
                            CodebookSource codebook, Population population, AlertRules alertRules,
                            Breakdowns breakdowns) {

    public DatasetConfig {
        waveOrder = waveOrder == null ? WaveOrder.NATURAL : waveOrder;
        compareWith = compareWith == null ? CompareWith.PREVIOUS : compareWith;
        exclude = exclude == null ? List.of() : List.copyOf(exclude);
        variables = variables == null ? List.of() : List.copyOf(variables);
        quietPeriod = quietPeriod == null ? java.time.Duration.ZERO : quietPeriod;
        alerts = alerts == null ? SinkSettings.NONE : alerts;
        relationships = relationships == null ? List.of() : List.copyOf(relationships);
        population = population == null ? Population.SAMPLE : population;
        alertRules = alertRules == null ? AlertRules.NONE : alertRules;
        breakdowns = breakdowns == null ? Breakdowns.NONE : breakdowns;
    }

    /** A dataset without breakdowns. */
    public DatasetConfig(String name, String table, String waveColumn, String tablePattern, WaveOrder waveOrder,
                         CompareWith compareWith, String schedule, List<String> exclude,
                         List<VariableConfig> variables, java.time.Duration quietPeriod, SinkSettings alerts,
                         String readyTable, String readyColumn, String weightColumn, String respondentKey,
                         ReleasesConfig releases, DesignColumns design, List<RelationshipConfig> relationships,
                         CodebookSource codebook, Population population, AlertRules alertRules) {
        this(name, table, waveColumn, tablePattern, waveOrder, compareWith, schedule, exclude, variables, quietPeriod,
                alerts, readyTable, readyColumn, weightColumn, respondentKey, releases, design, relationships,
                codebook, population, alertRules, null);
    }

    /** A sample dataset without alert rules. */
    public DatasetConfig(String name, String table, String waveColumn, String tablePattern, WaveOrder waveOrder,
                         CompareWith compareWith, String schedule, List<String> exclude,
                         List<VariableConfig> variables, java.time.Duration quietPeriod, SinkSettings alerts,
                         String readyTable, String readyColumn, String weightColumn, String respondentKey,
                         ReleasesConfig releases, DesignColumns design, List<RelationshipConfig> relationships,
                         CodebookSource codebook) {
        this(name, table, waveColumn, tablePattern, waveOrder, compareWith, schedule, exclude, variables, quietPeriod,
                alerts, readyTable, readyColumn, weightColumn, respondentKey, releases, design, relationships,
                codebook, null, null);
    }

    /** A dataset without a codebook. */
    public DatasetConfig(String name, String table, String waveColumn, String tablePattern, WaveOrder waveOrder,
                         CompareWith compareWith, String schedule, List<String> exclude,
                         List<VariableConfig> variables, java.time.Duration quietPeriod, SinkSettings alerts,
                         String readyTable, String readyColumn, String weightColumn, String respondentKey,
                         ReleasesConfig releases, DesignColumns design, List<RelationshipConfig> relationships) {
        this(name, table, waveColumn, tablePattern, waveOrder, compareWith, schedule, exclude, variables, quietPeriod,
                alerts, readyTable, readyColumn, weightColumn, respondentKey, releases, design, relationships, null);
    }

    /** The same dataset with other variables and codebook: what a codebook merge gives. */
    public DatasetConfig withVariables(List<VariableConfig> merged, CodebookSource source) {
        return new DatasetConfig(name, table, waveColumn, tablePattern, waveOrder, compareWith, schedule, exclude,
                merged, quietPeriod, alerts, readyTable, readyColumn, weightColumn, respondentKey, releases, design,
                relationships, source, population, alertRules, breakdowns);
    }

    /** A dataset without relationships. */
    public DatasetConfig(String name, String table, String waveColumn, String tablePattern, WaveOrder waveOrder,
                         CompareWith compareWith, String schedule, List<String> exclude,
                         List<VariableConfig> variables, java.time.Duration quietPeriod, SinkSettings alerts,
                         String readyTable, String readyColumn, String weightColumn, String respondentKey,
                         ReleasesConfig releases, DesignColumns design) {
        this(name, table, waveColumn, tablePattern, waveOrder, compareWith, schedule, exclude, variables, quietPeriod,
                alerts, readyTable, readyColumn, weightColumn, respondentKey, releases, design, List.of());
    }

    /** The column numbering releases within the table, or null when there is none. */
    public String releaseColumn() {
        return releases == null ? null : releases.column();
    }

    /**
     * Whether a column is bookkeeping rather than an answer: the wave and release columns, the respondent key, the
     * weight, the design and the excluded columns are never compared as variables.
     */
    public boolean isBookkeeping(String column) {
        return column.equals(waveColumn) || column.equals(releaseColumn()) || column.equals(respondentKey)
                || column.equals(weightColumn) || exclude.contains(column) || (design != null && design.names(column));
    }
}
