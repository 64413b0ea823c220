package org.wavewarden.deliver;

import org.wavewarden.judge.Finding;
import org.wavewarden.judge.Verdict;

import java.util.EnumMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * The digest for chat and e-mail: what changed, what is suspicious in the data, and the cautions. Every string
 * that comes from the data (dataset, wave labels, variables, the sentences quoting category values) goes through
 * {@link #escape(String)}, so it renders as text and never as markup.
 */
public final class MarkdownDigest {

    private MarkdownDigest() {
    }

    /** The digest of findings alone, with no review records: the digest a run writes beside its findings. */
    public static String render(List<FindingsReport> reports) {
        return render(reports, DigestRecords.NONE);
    }

    /**
     * The digest of the reports (in wave order) with what the results schema says beyond them: each wave's review
     * status line, its explained and muted alerts, and once per dataset whether it is a complete enumeration.
     * Findings still present since an earlier wave, problems that cleared, and the standing list of variables too
     * few answers can judge come from the findings themselves.
     */
    public static String render(List<FindingsReport> reports, DigestRecords records) {
        StringBuilder md = new StringBuilder();
        md.append("# Wavewarden change digest\n\n");
        md.append("> **Screening aid, not a finding.** ").append(Cautions.LINES.get(0)).append(' ')
                .append(Cautions.LINES.get(1)).append("\n\n");
        Set<String> introduced = new HashSet<>();
        for (FindingsReport r : reports) {
            boolean complete = records.complete(r.dataset());
            md.append("## ").append(escape(r.dataset())).append(": wave ").append(escape(r.wave()));
            md.append(r.againstWave() == null ? " (screened alone)" : " against " + escape(r.againstWave()))
                    .append("\n\n");
            if (complete && introduced.add(r.dataset())) {
                md.append("> **Complete enumeration.** ")
                        .append(escape(ReviewText.completeEnumeration(records.population(r.dataset()))))
                        .append("\n\n");
            }
            md.append(verdictCounts(r.findings()));
            if (complete) {
                md.append(" Judged by size of change alone.\n\n");
            } else {
                md.append(" False discovery rate ").append(r.alpha()).append(" (").append(r.fdrMethod())
                        .append(").\n\n");
            }
            java.util.Optional<WaveStatus> status = records.status(r.dataset(), r.wave());
            status.ifPresent(s -> md.append("**Review status:** ").append(escape(ReviewText.statusLine(s)))
                    .append("\n\n"));
            for (Finding changed : StandingFindings.signedWaveChanged(r)) {
                md.append("> **Signed-off wave changed.** ").append(escape(ReviewText.signedWaveChanged(changed,
                        status.map(WaveStatus::signOff).orElse(null)))).append("\n\n");
            }
            alerts(md, r, status.orElse(null));
            if (status.isPresent()) {
                list(md, "Explained", status.get().explained().stream().map(ReviewText::explained).toList());
                list(md, "Muted: recorded, not delivered", status.get().muted().stream().map(ReviewText::muted)
                        .toList());
            }
            list(md, "Still present, not alerted again", StandingFindings.stillPresent(r).stream()
                    .map(ReviewText::stillPresent).toList());
            list(md, "Cleared", StandingFindings.cleared(r).stream().map(ReviewText::cleared).toList());
            caseLists(md, records.caseLinks(r.dataset(), r.wave()));
        }
        Map<String, List<StandingFindings.TooFewAnswers>> tooFew = new java.util.LinkedHashMap<>();
        StandingFindings.tooFewAnswers(reports).forEach(t -> tooFew.computeIfAbsent(t.dataset(),
                k -> new java.util.ArrayList<>()).add(t));
        tooFew.forEach((dataset, list) -> {
            md.append("## ").append(escape(dataset)).append(": too few answers to judge\n\n")
                    .append(ReviewText.TOO_FEW_ANSWERS_INTRO).append("\n\n");
            list.forEach(t -> md.append("- ").append(escape(ReviewText.tooFewAnswers(t))).append('\n'));
            md.append('\n');
        });
        md.append("## Cautions\n\n");
        Cautions.LINES.forEach(l -> md.append("- ").append(l).append('\n'));
        return md.toString();
    }

    /** The alert table; an alert someone explained or muted says so beside its verdict (its entry is below). */
    private static void alerts(StringBuilder md, FindingsReport r, WaveStatus status) {
        List<Alert> alerts = Alerts.group(r.findings());
        if (alerts.isEmpty()) {
            md.append("Nothing needs attention.\n\n");
            return;
        }
        // One row per event: the lead's verdict and sentence, then what else was seen of the same variable.
        md.append("| verdict / kind | variable | what happened |\n|---|---|---|\n");
        for (Alert a : alerts) {
            String reviewed = status == null ? "" : status.reviewed(a.variable(), a.lead().kind().name())
                    .map(st -> " (" + st.name().toLowerCase(java.util.Locale.ROOT) + ")").orElse("");
            md.append("| ").append(label(a.lead())).append(reviewed).append(" | ").append(escape(a.variable()))
                    .append(a.lead().label() == null ? "" : " (" + escape(org.wavewarden.codebook.CodeLabels.shown(a.lead().label())) + ")")
                    .append(a.against() == null ? "" : ", " + escape(org.wavewarden.judge.Against.phrase(a.against())))
                    .append(" | ")
                    .append(escape(a.lead().sentence()));
            // Plain text, so the lead's verdict stays the only bold word of the row.
            for (Finding o : a.facets().subList(1, a.facets().size())) {
                md.append(" Also ").append(o.verdict() == null ? "" : o.verdict().name() + " ")
                        .append(o.kind().name()).append(": ").append(escape(o.sentence()));
            }
            md.append(" |\n");
        }
        md.append('\n');
        where(md, r, alerts);
    }

    /**
     * Each alerted finding's "Where it changed" tables, below the alert table (a Markdown table cannot hold one): per
     * breakdown column the domains ranked by contribution, the heterogeneity test, the overall split and what was not
     * compared, from the same {@link BreakdownView} as the HTML digest and the console.
     */
    private static void where(StringBuilder md, FindingsReport r, List<Alert> alerts) {
        for (Alert a : alerts) {
            for (Finding f : a.facets()) {
                if (f.breakdowns().isEmpty()) {
                    continue;
                }
                // The column of the finding's own baseline: a further baseline's waves, else the run's main one's.
                String before = f.against() != null ? org.wavewarden.judge.Against.wavesOf(f.against())
                        : r.againstWave() == null ? "baseline" : org.wavewarden.judge.Against.mainOf(r.againstWave());
                md.append("### Where it changed: ").append(escape(f.variable())).append(", ")
                        .append(escape(f.verdict() == null ? f.kind().name() : f.verdict() + " " + f.kind()))
                        .append("\n\n");
                for (org.wavewarden.compare.domain.Breakdown b : f.breakdowns()) {
                    BreakdownView v = BreakdownView.of(b, before, r.wave(), 1 - r.alpha());
                    md.append("**").append(escape(Character.toUpperCase(v.title().charAt(0)) + v.title().substring(1)))
                            .append("**\n\n|");
                    v.headings().forEach(h -> md.append(' ').append(escape(h)).append(" |"));
                    md.append("\n|");
                    for (int i = 0; i < v.headings().size(); i++) {
                        md.append(i == 0 ? "---|" : "---:|");
                    }
                    md.append('\n');
                    for (List<String> row : v.rows()) {
                        md.append('|');
                        row.forEach(c -> md.append(' ').append(escape(c)).append(" |"));
                        md.append('\n');
                    }
                    md.append('\n').append(escape(v.test())).append(' ').append(escape(v.overall())).append(' ')
                            .append(escape(v.method() == null || v.method().isEmpty() ? ""
                                    : Character.toUpperCase(v.method().charAt(0)) + v.method().substring(1)))
                            .append(".\n\n");
                    v.notes().forEach(n -> md.append("- ").append(escape(n)).append('\n'));
                    if (!v.notes().isEmpty()) {
                        md.append('\n');
                    }
                }
            }
        }
    }

    /**
     * The wave's case lists, each linked by its relative file name (safe characters only) with its count; the
     * subject is data and escaped.
     */
    private static void caseLists(StringBuilder md, List<CaseLink> links) {
        if (links.isEmpty()) {
            return;
        }
        md.append("### Case lists for the field team (").append(links.size()).append(")\n\n");
        links.forEach(c -> md.append("- ").append(escape(c.subject())).append(": [").append(escape(c.count()))
                .append("](").append(c.file()).append(")\n"));
        md.append('\n');
    }

    /** A titled list of sentences (each escaped whole), or nothing when there are none. */
    private static void list(StringBuilder md, String title, List<String> items) {
        if (items.isEmpty()) {
            return;
        }
        md.append("### ").append(title).append(" (").append(items.size()).append(")\n\n");
        items.forEach(i -> md.append("- ").append(escape(i)).append('\n'));
        md.append('\n');
    }

    /** {@code **MATERIAL** PANEL_SHIFT}; a distribution shift with a verdict is named by the verdict alone. */
    private static String label(Finding f) {
        String kind = f.kind() == org.wavewarden.judge.FindingKind.SHIFT ? "" : f.kind().name();
        return f.verdict() == null ? kind : ("**" + f.verdict() + "** " + kind).strip();
    }

    /**
     * {@code Shift verdicts: MATERIAL 1, MINOR 0, UNCERTAIN 2, STABLE 5. Data-quality findings: 3.}, with the
     * relationship verdicts after the shift verdicts when the wave has any.
     */
    static String verdictCounts(List<Finding> findings) {
        Map<Verdict, Integer> counts = new EnumMap<>(Verdict.class);
        Map<Verdict, Integer> relations = new EnumMap<>(Verdict.class);
        long dq = 0;
        for (Finding f : findings) {
            if (f.verdict() != null && f.kind().isShift()) {
                counts.merge(f.verdict(), 1, Integer::sum);
            } else if (f.verdict() != null && f.kind() == org.wavewarden.judge.FindingKind.RELATIONSHIP_CHANGE) {
                relations.merge(f.verdict(), 1, Integer::sum);
            } else if (f.kind().isDataQuality()) {
                dq++;
            }
        }
        StringBuilder sb = new StringBuilder("Shift verdicts: ");
        verdicts(sb, counts);
        if (!relations.isEmpty()) {
            sb.append(". Relationship verdicts: ");
            verdicts(sb, relations);
        }
        return sb.append(". Data-quality findings: ").append(dq).append('.').toString();
    }

    /** Every outcome of the verdict rule, and CLEARED (not one of its outcomes) only when a finding has it. */
    private static void verdicts(StringBuilder sb, Map<Verdict, Integer> counts) {
        List<String> parts = new java.util.ArrayList<>();
        for (Verdict v : Verdict.values()) {
            if (v != Verdict.CLEARED || counts.containsKey(v)) {
                parts.add(v.name() + ' ' + counts.getOrDefault(v, 0));
            }
        }
        sb.append(String.join(", ", parts));
    }

    /** Data in Markdown: see {@link DataText#markdown(String)}. */
    static String escape(String s) {
        return DataText.markdown(s);
    }
}
