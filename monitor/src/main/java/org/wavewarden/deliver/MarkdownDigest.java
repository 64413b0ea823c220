package org.wavewarden.deliver;

import org.wavewarden.judge.Finding;
import org.wavewarden.judge.Verdict;

import java.util.EnumMap;
import java.util.List;
import java.util.Map;

/**
 * The digest for chat and e-mail: what changed, what is suspicious in the data, and the cautions. Every string
 * that comes from the data (dataset, wave labels, variables, the sentences quoting category values) goes through
 * {@link #escape(String)}, so it renders as text and never as markup.
 */
public final class MarkdownDigest {

    private MarkdownDigest() {
    }

    public static String render(List<FindingsReport> reports) {
        StringBuilder md = new StringBuilder();
        md.append("# Wavewarden change digest\n\n");
        md.append("> **Screening aid, not a finding.** ").append(Cautions.LINES.get(0)).append(' ')
                .append(Cautions.LINES.get(1)).append("\n\n");
        for (FindingsReport r : reports) {
            md.append("## ").append(escape(r.dataset())).append(": wave ").append(escape(r.wave()));
            md.append(r.againstWave() == null ? " (screened alone)" : " against " + escape(r.againstWave()))
                    .append("\n\n");
            md.append(verdictCounts(r.findings())).append(" False discovery rate ")
                    .append(r.alpha()).append(" (").append(r.fdrMethod()).append(").\n\n");
            List<Alert> alerts = Alerts.group(r.findings());
            if (alerts.isEmpty()) {
                md.append("Nothing needs attention.\n\n");
                continue;
            }
            // One row per event: the lead's verdict and sentence, then what else was seen of the same variable.
            md.append("| verdict / kind | variable | what happened |\n|---|---|---|\n");
            for (Alert a : alerts) {
                md.append("| ").append(label(a.lead())).append(" | ").append(escape(a.variable()))
                        .append(a.lead().label() == null ? "" : " (" + escape(org.wavewarden.codebook.CodeLabels.shown(a.lead().label())) + ")").append(" | ")
                        .append(escape(a.lead().sentence()));
                // Plain text, so the lead's verdict stays the only bold word of the row.
                for (Finding o : a.facets().subList(1, a.facets().size())) {
                    md.append(" Also ").append(o.verdict() == null ? "" : o.verdict().name() + " ")
                            .append(o.kind().name()).append(": ").append(escape(o.sentence()));
                }
                md.append(" |\n");
            }
            md.append('\n');
        }
        md.append("## Cautions\n\n");
        Cautions.LINES.forEach(l -> md.append("- ").append(l).append('\n'));
        return md.toString();
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

    private static void verdicts(StringBuilder sb, Map<Verdict, Integer> counts) {
        for (Verdict v : Verdict.values()) {
            sb.append(v.name()).append(' ').append(counts.getOrDefault(v, 0)).append(v == Verdict.STABLE ? "" : ", ");
        }
    }

    /** Data in Markdown: see {@link DataText#markdown(String)}. */
    static String escape(String s) {
        return DataText.markdown(s);
    }
}
