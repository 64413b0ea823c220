package org.wavewarden.deliver;

import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Which findings become alerts: shifts judged MATERIAL or UNCERTAIN, and data-quality findings, unless they repeat
 * the previous wave's finding ({@link org.wavewarden.judge.Repeats}). MINOR and STABLE verdicts stay in the findings (a reader can audit them) but do not ask for anyone's time. The findings that do
 * are grouped into events ({@link #group}), one alert each.
 */
public final class Alerts {

    private Alerts() {
    }

    /**
     * Whether a finding asks for a person's time with a new alert. A repeat of the previous wave's finding (still
     * present, still too few answers to judge) does not: it was alerted when it first appeared and stays in the
     * findings and the digest's sections, with a note saying since when.
     */
    public static boolean worthAPerson(Finding f) {
        if (f.kind() == FindingKind.SKIPPED || f.repeat() != null) {
            return false;
        }
        if (f.verdict() != null) {
            return f.verdict() == Verdict.MATERIAL || f.verdict() == Verdict.UNCERTAIN;
        }
        return f.kind().isDataQuality() && f.kind() != FindingKind.MISSING_CODE;
    }

    /** The findings worth a person, most urgent first, one by one. */
    public static List<Finding> select(List<Finding> findings) {
        return FindingsFiles.ordered(findings).stream().filter(Alerts::worthAPerson).toList();
    }

    /**
     * The alerts of one judged wave: the findings worth a person grouped by the variable they are about, each group
     * led by its most urgent finding and the groups in the order of their leads. A relationship (about two
     * variables) and a finding on the whole wave are alerts of their own.
     */
    public static List<Alert> group(List<Finding> findings) {
        Map<Event, List<Finding>> byEvent = new LinkedHashMap<>();
        for (Finding f : select(findings)) {
            byEvent.computeIfAbsent(event(f), k -> new ArrayList<>()).add(f);
        }
        return byEvent.values().stream().map(Alert::new).toList();
    }

    /**
     * What makes two findings of one wave the same event: the variable and the baseline it was judged against
     * ({@link Finding#against}, null for the run's main one), or for a finding that is an event of its own also its
     * kind (so a relationship named like a column never joins that column's alert). A change against the same
     * quarter a year back and one against the previous wave are two events: the first says the season moved, the
     * second may only be the season itself, and each is looked at, muted or closed on its own.
     */
    private record Event(String variable, FindingKind ownKind, String against) {
    }

    private static Event event(Finding f) {
        Alert.Facet facet = Alert.Facet.of(f.kind());
        boolean own = facet == Alert.Facet.RELATIONSHIP || facet == Alert.Facet.WAVE;
        return new Event(f.variable(), own ? f.kind() : null, f.against());
    }
}
