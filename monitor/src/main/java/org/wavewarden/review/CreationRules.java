package org.wavewarden.review;

import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.MuteRule;
import org.wavewarden.deliver.Alert;

import java.time.LocalDate;
import java.util.List;
import java.util.Optional;
import java.util.function.Function;

/**
 * Which alerts the configuration explains or mutes when they are created: an expected change whose variable and
 * wave range match explains; otherwise a mute rule (from the configuration or stored by a command) that matches
 * and has not expired mutes.
 */
public final class CreationRules {

    private CreationRules() {
    }

    /**
     * @param waveOrder  the dataset's waves in order (wave ranges are read in it)
     * @param wave       the judged wave
     * @param today      the day the run is made (date expiries are read against it)
     * @param storedMutes mute rules stored by commands, still in force
     */
    public static Function<Alert, Optional<CreationDecision>> decider(DatasetConfig d, List<String> waveOrder,
                                                                      String wave, LocalDate today,
                                                                      List<MuteRule> storedMutes) {
        return a -> Optional.empty();
    }
}
