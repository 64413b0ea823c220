package org.wavewarden.missing;

import org.wavewarden.config.VariableConfig;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.WaveProfile;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * One wave after the missing-values stage, screened once per run: every variable (declared, or inferred with the
 * note saying how) with its valid answers and missing reasons. Every comparison of the run, the panel's pairs, the
 * relationships, a release comparison and the digest read their answers from here, so that an answer left out of
 * one comparison is left out of all of them, and no consumer screens a wave again.
 *
 * <p>A variable whose screening failed keeps its failure: asking for it throws that failure, so the one variable
 * that cannot be analysed is skipped where it is used and the rest of the run goes on.
 */
public final class ScreenedWave {

    private final String wave;
    private final Map<String, ColumnTally> columns;
    private final List<VariableConfig> variables;
    private final List<String> inference;
    private final Map<String, ScreenedVariable> screened;
    private final Map<String, RuntimeException> failed;

    private ScreenedWave(String wave, Map<String, ColumnTally> columns, List<VariableConfig> variables,
                         List<String> inference, Map<String, ScreenedVariable> screened,
                         Map<String, RuntimeException> failed) {
        this.wave = wave;
        this.columns = columns;
        this.variables = List.copyOf(variables);
        this.inference = List.copyOf(inference);
        this.screened = screened;
        this.failed = failed;
    }

    /**
     * Screens every variable that has a tally in the wave.
     *
     * @param wave      the wave's label (or the side of a release comparison)
     * @param columns   the wave's tallies by column
     * @param weights   per column and value the weight sums ({@code {sum w, sum w^2}}), or null to screen unweighted
     * @param variables the variables to screen, in report order; the judged wave's, so that both sides of a
     *                  comparison are screened as the same kinds
     * @param inference how the kinds of undeclared variables were inferred, one line each
     */
    public static ScreenedWave screen(String wave, Map<String, ColumnTally> columns,
                                      Map<String, Map<String, double[]>> weights, List<VariableConfig> variables,
                                      List<String> inference) {
        Map<String, ScreenedVariable> screened = new LinkedHashMap<>();
        Map<String, RuntimeException> failed = new LinkedHashMap<>();
        for (VariableConfig v : variables) {
            ColumnTally t = columns.get(v.name());
            if (t == null) {
                continue;
            }
            try {
                screened.put(v.name(), VariableScreen.screen(t, v, weights == null ? null : weights.get(v.name())));
            } catch (RuntimeException e) {
                failed.put(v.name(), e);
            }
        }
        return new ScreenedWave(wave, columns, variables, inference, screened, failed);
    }

    /** The same for a wave's summary, weighted when {@code weighted} and the summary holds weight sums. */
    public static ScreenedWave screen(WaveProfile profile, boolean weighted, List<VariableConfig> variables,
                                      List<String> inference) {
        return screen(profile.wave(), profile.columns(), weighted ? profile.weights() : null, variables, inference);
    }

    public String wave() {
        return wave;
    }

    /** The tallies the screen read, by column: the counts of every raw answer before screening. */
    public Map<String, ColumnTally> columns() {
        return columns;
    }

    /** A column's tally, or null when the wave has none. */
    public ColumnTally tally(String column) {
        return columns.get(column);
    }

    /** The variables screened (declared first, then inferred), whether or not this wave has each of them. */
    public List<VariableConfig> variables() {
        return variables;
    }

    /** The variable of that name, declared or inferred. */
    public Optional<VariableConfig> variable(String name) {
        return variables.stream().filter(v -> v.name().equals(name)).findFirst();
    }

    /** How the kind of each undeclared variable was inferred. */
    public List<String> inference() {
        return inference;
    }

    /**
     * A variable's screened answers in this wave, empty when the wave has no tally of it.
     *
     * @throws RuntimeException the failure of its screening, when it could not be screened
     */
    public Optional<ScreenedVariable> get(String name) {
        RuntimeException e = failed.get(name);
        if (e != null) {
            throw e;
        }
        return Optional.ofNullable(screened.get(name));
    }
}
