package org.wavewarden.deliver;

import org.wavewarden.review.AlertState;
import org.wavewarden.review.AlertView;
import org.wavewarden.review.ReviewEntry;
import org.wavewarden.review.SignOff;

import java.util.ArrayList;
import java.util.Collections;
import java.util.EnumMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.function.Function;

/**
 * What people concluded about one judged wave, as the digests show it beside the wave's findings: how many of its
 * alerts are open, explained or muted, the explained and muted ones with the action that put them there, and the
 * wave's latest sign-off. A superseded alert belongs to a run the wave no longer stands on, so it is not counted.
 *
 * @param counts    the wave's alerts by state, SUPERSEDED never among them
 * @param explained the explained alerts with their explaining entry, oldest alert first
 * @param muted     the muted alerts with their muting entry (expiry, who, which rule), oldest alert first
 * @param signOff   the wave's latest sign-off, or null when it has none
 */
public record WaveStatus(String dataset, String wave, Map<AlertState, Integer> counts, List<Reviewed> explained,
                         List<Reviewed> muted, SignOff signOff) {

    /**
     * An alert with the entry of its history that gave it its state.
     *
     * @param entry the explaining or muting entry; null when the history did not say (an alert stored before
     *              histories were kept)
     */
    public record Reviewed(AlertView alert, ReviewEntry entry) {
        public Reviewed {
            Objects.requireNonNull(alert, "alert");
        }
    }

    public WaveStatus {
        Objects.requireNonNull(dataset, "dataset");
        Objects.requireNonNull(wave, "wave");
        Map<AlertState, Integer> c = new EnumMap<>(AlertState.class);
        if (counts != null) {
            counts.forEach((k, v) -> {
                if (k != AlertState.SUPERSEDED && v != null && v > 0) {
                    c.put(k, v);
                }
            });
        }
        counts = Collections.unmodifiableMap(c);
        explained = explained == null ? List.of() : List.copyOf(explained);
        muted = muted == null ? List.of() : List.copyOf(muted);
    }

    /**
     * The status of a wave from its alerts as the results schema lists them (every run's) and its latest sign-off.
     *
     * @param entryOf the entry that put an explained or muted alert in its state; asked only for those
     */
    public static WaveStatus of(String dataset, String wave, List<AlertView> alerts,
                                Function<AlertView, ReviewEntry> entryOf, SignOff signOff) {
        Map<AlertState, Integer> counts = new EnumMap<>(AlertState.class);
        List<Reviewed> explained = new ArrayList<>();
        List<Reviewed> muted = new ArrayList<>();
        for (AlertView a : alerts) {
            if (!dataset.equals(a.dataset()) || !wave.equals(a.wave()) || a.state() == AlertState.SUPERSEDED) {
                continue;
            }
            counts.merge(a.state(), 1, Integer::sum);
            if (a.state() == AlertState.EXPLAINED) {
                explained.add(new Reviewed(a, entryOf.apply(a)));
            } else if (a.state() == AlertState.MUTED) {
                muted.add(new Reviewed(a, entryOf.apply(a)));
            }
        }
        return new WaveStatus(dataset, wave, counts, explained, muted, signOff);
    }

    /**
     * The review state of the wave's alert led by this variable and kind, when someone explained or muted it;
     * empty for an open alert or one these records do not hold.
     */
    public java.util.Optional<AlertState> reviewed(String variable, String kind) {
        for (List<Reviewed> list : List.of(explained, muted)) {
            for (Reviewed r : list) {
                if (r.alert().variable().equals(variable) && r.alert().kind().equals(kind)) {
                    return java.util.Optional.of(r.alert().state());
                }
            }
        }
        return java.util.Optional.empty();
    }

    /** The wave's alerts in a state; 0 for SUPERSEDED. */
    public int count(AlertState state) {
        return counts.getOrDefault(state, 0);
    }
}
