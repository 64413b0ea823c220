package org.wavewarden.review;

import java.util.List;

/** When a wave may be signed off: not while one of its MATERIAL alerts is open, unless forced with a reason. */
public final class SignOffRule {

    private SignOffRule() {
    }

    /**
     * The alerts that stand in the way of signing off a wave, from the wave's current alerts: those led by a
     * MATERIAL finding and still OPEN. An explained or muted alert has been looked at; a superseded one is no
     * longer the wave's (its run was replaced); an UNCERTAIN or data-quality alert does not say the numbers moved.
     */
    public static List<AlertView> blocking(List<AlertView> waveAlerts) {
        return waveAlerts.stream()
                .filter(a -> "MATERIAL".equals(a.verdict()) && a.state() == AlertState.OPEN)
                .toList();
    }

    /** Why the wave cannot be signed off, naming each blocking alert (id, variable, kind). */
    public static String refusal(String dataset, String wave, List<AlertView> blocking) {
        StringBuilder b = new StringBuilder("Wave " + wave + " of " + dataset + " cannot be signed off: "
                + blocking.size() + (blocking.size() == 1 ? " MATERIAL alert is" : " MATERIAL alerts are")
                + " open (");
        for (int i = 0; i < blocking.size(); i++) {
            AlertView a = blocking.get(i);
            b.append(i == 0 ? "" : "; ").append("alert ").append(a.alertId()).append(", ").append(a.variable())
                    .append(", ").append(a.kind());
        }
        return b.append("). Explain or mute ").append(blocking.size() == 1 ? "it" : "them")
                .append(", or force the sign-off with a reason.").toString();
    }
}
