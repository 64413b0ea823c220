package org.wavewarden.pipeline;

import org.junit.jupiter.api.Test;
import org.wavewarden.compare.panel.PairedPanel.Panel;
import org.wavewarden.config.CompareWith;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.missing.VariableScreen;
import org.wavewarden.profile.WaveProfile;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;

/**
 * A check screens each variable of each wave once: the comparisons, the data-quality findings and the panel's pairs
 * take their answers from the run's screened waves and never screen again.
 */
class ScreenOncePerRunTest {

    @Test
    void aPanelCheckScreensEachVariableOfEachWaveOnce() {
        DatasetConfig d = PanelPairsTest.dataset(CompareWith.PREVIOUS, "pid");
        WaveProfile baseline = PanelPairsTest.profile("w1", PanelPairsTest.W1);
        WaveProfile current = PanelPairsTest.profile("w2", PanelPairsTest.W2);
        WardenConfig cfg = new WardenConfig(null, null, 0.05, WardenConfig.FdrMethod.BENJAMINI_HOCHBERG, List.of(d),
                null);
        long before = VariableScreen.screensSoFar();

        WaveJudge.Screened screened = WaveJudge.screen(d, current, baseline);
        Panel panel = PanelPairsTest.pair(PanelPairs.plan(d, List.of("w1"), baseline, current, screened),
                PanelPairsTest.W1, PanelPairsTest.W2);
        WaveJudge.Profiled judged = WaveJudge.findings(cfg, d, current, baseline, screened, panel);

        assertFalse(judged.findings().isEmpty());
        assertEquals(2 * PanelPairsTest.COLUMNS.size(), VariableScreen.screensSoFar() - before,
                "4 variables in 2 waves, each screened once");
    }
}
