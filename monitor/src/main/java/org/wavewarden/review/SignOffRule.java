package org.wavewarden.review;

import java.util.List;

/** When a wave may be signed off: not while one of its MATERIAL alerts is open, unless forced with a reason. */
public final class SignOffRule {

    private SignOffRule() {
    }

    /** The alerts that stand in the way of signing off a wave, from the wave's current alerts. */
    public static List<AlertView> blocking(List<AlertView> waveAlerts) {
        throw new UnsupportedOperationException("to be written");
    }
}
