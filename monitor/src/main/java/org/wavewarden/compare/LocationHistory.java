package org.wavewarden.compare;

import java.util.ArrayList;
import java.util.List;
import org.wavewarden.compare.location.LocationTestChoice;
import org.wavewarden.config.LocationTestPin;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.profile.WaveProfile;
import org.wavewarden.missing.ScreenedVariable;
import org.wavewarden.missing.ScreenedWave;

/**
 * The earliest waves of a dataset before the judged one (at most {@link LocationTestChoice#HISTORY_WAVES}, oldest
 * first), from which a continuous variable's location test is chosen so that it stays the same from wave to wave.
 *
 * @param waves         the stored summaries of those waves
 * @param baselineLabel the wave (or pooled waves) the judged wave is compared against
 */
public record LocationHistory(List<WaveProfile> waves, String baselineLabel) {

    public LocationHistory {
        waves = List.copyOf(waves);
    }

    /**
     * The location test of a variable: its pin in the configuration; else, for a continuous variable in a series
     * of waves ({@code history} not null), the choice from its first waves with answers, or from the baseline when
     * none of the history's waves has its answers (a column added later); else null, which leaves the choice to
     * the two waves compared (two releases of one wave).
     */
    public static LocationTestChoice.Choice choice(VariableConfig v, LocationHistory history, ScreenedVariable baseline) {
        if (v.kind() != VariableKind.CONTINUOUS) {
            return null;
        }
        if (v.locationTest() != null) {
            return LocationTestChoice.pinned(v.locationTest() == LocationTestPin.MEANS
                    ? LocationTestChoice.LocationTest.WELCH_T : LocationTestChoice.LocationTest.MANN_WHITNEY,
                    "locationTest: " + v.locationTest().configName());
        }
        if (history == null) {
            return null;
        }
        List<String> labels = new ArrayList<>();
        List<org.wavewarden.profile.NumericDistribution> answers = new ArrayList<>();
        for (WaveProfile p : history.waves()) {
            // Each history wave's answers pass the same screen as the judged waves' (unweighted: the choice is
            // about the shape of the answers).
            var numeric = p.columns().get(v.name()) == null ? null : ScreenedWave.screen(p, false, List.of(v),
                    List.of()).get(v.name()).map(ScreenedVariable::numeric).orElse(null);
            if (numeric != null && numeric.n() > 0) {
                labels.add(p.wave());
                answers.add(numeric);
            }
        }
        if (answers.isEmpty()) {
            return baseline == null || baseline.numeric() == null || baseline.numeric().n() == 0 ? null
                    : LocationTestChoice.fromBaseline(history.baselineLabel(), baseline.numeric());
        }
        return LocationTestChoice.fromHistory(labels, answers);
    }
}
