package org.wavewarden.deliver;

import org.wavewarden.config.Population;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.AlertView;
import org.wavewarden.review.ReviewEntry;
import org.wavewarden.review.SignOff;

import java.time.Instant;
import java.time.ZoneOffset;
import java.time.format.DateTimeFormatter;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * The sentences both digests write about reviews, sign-offs and standing findings, as plain text: each digest
 * escapes a whole sentence for its own format (Markdown with {@link DataText#markdown}, HTML with its own
 * escaping), so names, notes and labels in them stay text, and the two digests say the same thing.
 */
public final class ReviewText {

    private static final DateTimeFormatter WHEN =
            DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm 'UTC'", Locale.ROOT).withZone(ZoneOffset.UTC);

    private ReviewText() {
    }

    /**
     * {@code Alerts: 2 open, 1 explained, 0 muted. Signed off by Ann Reeve on 2026-11-30 09:12 UTC (release r2).}
     */
    public static String statusLine(WaveStatus s) {
        StringBuilder sb = new StringBuilder("Alerts: ").append(s.count(AlertState.OPEN)).append(" open, ")
                .append(s.count(AlertState.EXPLAINED)).append(" explained, ").append(s.count(AlertState.MUTED))
                .append(" muted. ");
        return sb.append(signOff(s.signOff())).toString();
    }

    /** {@code Not signed off.}, or who signed the wave off, when, which release, and the reason when forced. */
    public static String signOff(SignOff so) {
        if (so == null) {
            return "Not signed off.";
        }
        StringBuilder sb = new StringBuilder("Signed off by ").append(so.actor()).append(" on ")
                .append(when(so.signedAt()));
        List<String> notes = new ArrayList<>();
        if (so.release() != null && !so.release().isEmpty()) {
            notes.add("release " + so.release());
        }
        if (so.forced()) {
            notes.add("forced: " + (so.forceReason() == null ? "no reason recorded" : so.forceReason()));
        }
        if (!notes.isEmpty()) {
            sb.append(" (").append(String.join("; ", notes)).append(')');
        }
        return sb.append('.').toString();
    }

    /**
     * The loud line of a wave whose findings changed after it was signed off: the release was signed on other
     * numbers.
     */
    public static String signedWaveChanged(Finding f, SignOff so) {
        StringBuilder sb = new StringBuilder("The findings of this wave changed after it was signed off");
        if (so != null) {
            sb.append(" by ").append(so.actor()).append(" on ").append(when(so.signedAt())).append(" (run ")
                    .append(so.runId()).append(')');
        }
        sb.append(": the release was signed on other numbers.");
        if (f.sentence() != null && !f.sentence().isBlank()) {
            sb.append(' ').append(f.sentence());
        }
        return sb.toString();
    }

    /** An explained alert: what it is, the reason category's meaning, the note, who and when. */
    public static String explained(WaveStatus.Reviewed r) {
        StringBuilder sb = new StringBuilder(alert(r.alert())).append(": ");
        ReviewEntry e = r.entry();
        if (e == null) {
            return sb.append("explained; its history does not say by whom.").toString();
        }
        sb.append(e.reason() == null ? "explained" : e.reason().meaning()).append('.');
        note(sb, e);
        return by(sb, e).toString();
    }

    /** A muted alert: what it is, until when, the rule or action that muted it, the reason and note, who. */
    public static String muted(WaveStatus.Reviewed r) {
        StringBuilder sb = new StringBuilder(alert(r.alert())).append(": muted");
        ReviewEntry e = r.entry();
        if (e == null) {
            return sb.append("; its history does not say by whom or until when.").toString();
        }
        List<String> until = new ArrayList<>();
        if (e.untilWave() != null) {
            until.add("wave " + e.untilWave());
        }
        if (e.untilDate() != null) {
            until.add(e.untilDate().toString());
        }
        sb.append(until.isEmpty() ? " with no expiry" : " until " + String.join(" or ", until));
        if (e.source() != null && !e.source().isBlank()) {
            sb.append(" (").append(e.source()).append(')');
        }
        if (e.reason() != null) {
            sb.append(", ").append(e.reason().meaning());
        }
        sb.append('.');
        note(sb, e);
        return by(sb, e).toString();
    }

    /** A data-quality finding carried from an earlier wave without a new alert. */
    public static String stillPresent(Finding f) {
        StringBuilder sb = new StringBuilder(f.variable()).append(" (").append(kindLabel(f.kind())).append("): ");
        if (f.sentence() != null && !f.sentence().isBlank()) {
            sb.append(f.sentence()).append(' ');
        }
        Finding.Repeat r = f.repeat();
        sb.append("Still present");
        if (r != null && r.firstWave() != null) {
            sb.append(", first alerted in wave ").append(r.firstWave());
        }
        if (r != null && r.previousWave() != null && !r.previousWave().equals(r.firstWave())) {
            sb.append(", unchanged from wave ").append(r.previousWave());
        }
        return sb.append('.').toString();
    }

    /** A problem that cleared: good news, never alerted. */
    public static String cleared(Finding f) {
        StringBuilder sb = new StringBuilder(f.variable()).append(" (").append(kindLabel(f.kind())).append("): ");
        return sb.append(f.sentence() == null || f.sentence().isBlank() ? "cleared." : f.sentence()).toString();
    }

    /**
     * {@code mooring_fee (distribution shift, Hedges' g): smallest detectable change ±0.460, threshold ±0.200, on
     * 37 answers in wave 2025-Q1; too few answers to judge since wave 2024-Q2.}
     */
    public static String tooFewAnswers(StandingFindings.TooFewAnswers t) {
        StringBuilder sb = new StringBuilder(t.variable());
        if (t.label() != null && !t.label().isBlank()) {
            sb.append(" \"").append(t.label()).append('"');
        }
        sb.append(" (").append(kindLabel(t.kind())).append(", ").append(t.effect().name()).append("): smallest")
                .append(" detectable change ").append(plusMinus(t.minimumDetectable())).append(", threshold ")
                .append(plusMinus(t.threshold()));
        if (t.nCurrent() != null) {
            sb.append(", on ").append(t.nCurrent()).append(" answers");
        }
        sb.append(" in wave ").append(t.latestWave()).append("; too few answers to judge since wave ")
                .append(t.sinceWave()).append('.');
        return sb.toString();
    }

    /** What the standing section is, before its list. */
    public static final String TOO_FEW_ANSWERS_INTRO = "On these samples the smallest change the two waves could"
            + " show is at least the variable's threshold, so no verdict other than UNCERTAIN is possible: more"
            + " answers, not another wave, would settle it. Each is listed here once and alerted again only when"
            + " its state changes.";

    /** The once-per-dataset statement of a complete enumeration. */
    public static String completeEnumeration(Population p) {
        String what = p == Population.REGISTER ? "a full register" : "a census";
        return "This dataset is " + what + ": every unit of the population is observed, not a sample. Each change"
                + " is judged by its size against the threshold alone, with no p-values, q-values or sampling"
                + " intervals (a test answers a question about a population not fully observed). Partial"
                + " nonresponse is reported as missingness.";
    }

    /** A distribution shift is named by its verdict; other kinds in words. */
    public static String kindLabel(FindingKind k) {
        return switch (k) {
            case SHIFT -> "distribution shift";
            case PANEL_SHIFT -> "shift within respondents";
            case SHAPE_CHANGE -> "change of shape";
            case RELATIONSHIP_CHANGE -> "relationship change";
            case MISSING_RATE_CHANGE -> "missing rate change";
            default -> k.name().toLowerCase(Locale.ROOT).replace('_', ' ');
        };
    }

    static String when(Instant at) {
        return at == null ? "an unknown date" : WHEN.format(at);
    }

    /** {@code ±0.200}; an interval without end is {@code unbounded}. */
    static String plusMinus(double v) {
        return Double.isInfinite(v) ? "unbounded" : "\u00b1" + String.format(Locale.ROOT, "%.3g", v);
    }

    /** {@code mooring_fee (distribution shift, UNCERTAIN)}: the alert named by its lead. */
    private static String alert(AlertView a) {
        String kind;
        try {
            kind = kindLabel(FindingKind.valueOf(a.kind()));
        } catch (IllegalArgumentException | NullPointerException e) {
            // A kind stored by another release of the monitor is shown as stored.
            kind = String.valueOf(a.kind());
        }
        return a.variable() + " (" + kind + (a.verdict() == null ? "" : ", " + a.verdict()) + ")";
    }

    private static void note(StringBuilder sb, ReviewEntry e) {
        if (e.note() != null && !e.note().isBlank()) {
            sb.append(" Note: ").append(e.note().strip()).append(e.note().strip().matches(".*[.!?]$") ? "" : ".");
        }
    }

    private static StringBuilder by(StringBuilder sb, ReviewEntry e) {
        return sb.append(" By ").append(e.actor()).append(" on ").append(when(e.at())).append('.');
    }
}
