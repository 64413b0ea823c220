package org.wavewarden.deliver;

import org.wavewarden.compare.release.ReleaseRevision;
import org.wavewarden.compare.release.ReleaseRevision.CellChange;
import org.wavewarden.compare.release.ReleaseRevision.VariableChanges;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * The release comparison for people: {@code releases.md} for chat and e-mail, the lines the command prints, and
 * {@code releases.json} beside them.
 */
public final class ReleaseDigest {

    private ReleaseDigest() {
    }

    /** Writes {@code releases.json} and {@code releases.md} into {@code dir}; returns the JSON file. */
    public static Path write(Path dir, ReleaseReport report) {
        try {
            Files.createDirectories(dir);
            Path json = dir.resolve("releases.json");
            Files.writeString(json, json(report), StandardCharsets.UTF_8);
            Files.writeString(dir.resolve("releases.md"), markdown(report), StandardCharsets.UTF_8);
            return json;
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write the release comparison to " + dir, e);
        }
    }

    /** The content of {@code releases.json}, as written to the file and stored with the comparison. */
    public static String json(ReleaseReport report) {
        try {
            return Json.mapper().writer().with(com.fasterxml.jackson.databind.SerializationFeature.INDENT_OUTPUT)
                    .writeValueAsString(report) + "\n";
        } catch (com.fasterxml.jackson.core.JsonProcessingException e) {
            throw new IllegalStateException("the release comparison cannot be written as JSON", e);
        }
    }

    public static String markdown(ReleaseReport r) {
        ReleaseRevision v = r.revision();
        StringBuilder md = new StringBuilder("# Wavewarden release comparison\n\n");
        md.append("> **Screening aid, not a finding.** ").append(Cautions.LINES.get(0)).append(' ')
                .append(Cautions.LINES.get(1)).append("\n\n");
        md.append("## ").append(MarkdownDigest.escape(r.dataset())).append(": wave ")
                .append(MarkdownDigest.escape(r.wave())).append(", ").append(MarkdownDigest.escape(r.after()))
                .append(" against ").append(MarkdownDigest.escape(r.before())).append("\n\n");
        md.append(MarkdownDigest.escape(rowsSentence(r))).append("\n\n");
        List<String> problems = new ArrayList<>(v.notes());
        if (!r.columnsAdded().isEmpty() || !r.columnsDropped().isEmpty()) {
            problems.add("Not compared: columns only in " + r.after() + ": " + r.columnsAdded() + "; only in "
                    + r.before() + ": " + r.columnsDropped() + ".");
        }
        problems.forEach(n -> md.append("- ").append(MarkdownDigest.escape(n)).append('\n'));
        md.append(problems.isEmpty() ? "" : "\n").append("### Changed cells\n\n");
        md.append("Among the respondents in both releases, a cell changed when its published text differs, NULL"
                + " against a value included. Examples are the smallest respondent keys.\n\n");
        md.append("| variable | changed | of | share | value to NULL | NULL to value | examples (key: before → after)"
                + " |\n|---|---:|---:|---:|---:|---:|---|\n");
        for (VariableChanges c : v.variables()) {
            md.append("| ").append(MarkdownDigest.escape(c.variable())).append(" | ").append(c.changedCells())
                    .append(" | ")
                    .append(c.comparedCells()).append(" | ").append(share(c.shareChanged())).append(" | ")
                    .append(c.becameNull()).append(" | ").append(c.becameValue()).append(" | ")
                    .append(MarkdownDigest.escape(examples(c.examples()))).append(" |\n");
        }
        md.append("\n### Distributions of the two releases\n\n");
        md.append(MarkdownDigest.verdictCounts(v.findings())).append(" False discovery rate ").append(r.alpha())
                .append(" (").append(r.fdrMethod()).append("), ").append(MarkdownDigest.escape(r.before()))
                .append(" as the baseline.\n\n");
        List<Finding> worth = FindingsFiles.ordered(v.findings()).stream().filter(Alerts::worthAPerson).toList();
        if (worth.isEmpty()) {
            md.append("Nothing needs attention.\n\n");
        } else {
            md.append("| verdict / kind | variable | what happened |\n|---|---|---|\n");
            for (Finding f : worth) {
                md.append("| ").append(f.verdict() != null ? "**" + f.verdict() + "** " : "")
                        .append(f.kind() == FindingKind.SHIFT ? "" : f.kind().name()).append(" | ")
                        .append(MarkdownDigest.escape(f.variable())).append(" | ")
                        .append(MarkdownDigest.escape(f.sentence())).append(" |\n");
            }
            md.append('\n');
        }
        md.append("## Cautions\n\n");
        r.cautions().forEach(l -> md.append("- ").append(l).append('\n'));
        return md.toString();
    }

    /** What the command prints: the counts, each column with changed cells, the key problems, the distributions. */
    public static String summary(ReleaseReport r, boolean all) {
        ReleaseRevision v = r.revision();
        StringBuilder sb = new StringBuilder();
        sb.append(DataText.visible(r.dataset())).append(" wave ").append(DataText.visible(r.wave())).append(": ")
                .append(DataText.visible(r.after())).append(" against ").append(DataText.visible(r.before()))
                .append('\n');
        sb.append("  ").append(DataText.visible(rowsSentence(r))).append('\n');
        List<VariableChanges> changedColumns = v.variables().stream().filter(c -> c.changedCells() > 0).toList();
        sb.append("  changed cells:").append(changedColumns.isEmpty() ? " none" : "").append('\n');
        for (VariableChanges c : changedColumns) {
            sb.append(String.format(Locale.ROOT, "    %-22s %,d of %,d (%s)%s%n",
                    ConsoleTable.cut(DataText.visible(c.variable()), 22), c.changedCells(), c.comparedCells(),
                    share(c.shareChanged()),
                    c.examples().isEmpty() ? "" : ", e.g. " + examples(c.examples().subList(0, 1))));
        }
        v.notes().forEach(n -> sb.append("  ").append(DataText.visible(n)).append('\n'));
        sb.append("  distributions: ").append(MarkdownDigest.verdictCounts(v.findings())).append('\n');
        FindingsReport asWave = new FindingsReport(r.dataset(), r.wave() + " " + r.after(), r.before(),
                r.generatedAt(), r.alpha(), r.fdrMethod(), v.inference(), v.findings());
        ConsoleTable.render(asWave, all).lines().skip(1).forEach(l -> sb.append("  ").append(l).append('\n'));
        return sb.toString();
    }

    static String rowsSentence(ReleaseReport r) {
        ReleaseRevision v = r.revision();
        return String.format(Locale.ROOT, "Rows: %,d in %s, %,d in %s; %,d respondent(s) in both, %,d added%s,"
                        + " %,d removed%s.", v.rowsBefore(), r.before(), v.rowsAfter(), r.after(), v.matched(),
                v.added(), keys(v.addedExamples()), v.removed(), keys(v.removedExamples()));
    }

    static String keys(List<String> examples) {
        return examples.isEmpty() ? "" : " (for example " + String.join(", ", examples) + ")";
    }

    static String examples(List<CellChange> examples) {
        List<String> out = new ArrayList<>();
        for (CellChange c : examples) {
            out.add(DataText.visible(c.key()) + ": " + shown(c.before()) + " → " + shown(c.after()));
        }
        return String.join("; ", out);
    }

    /** A value as a reader can see it: quoted, with tabs, line breaks and invisible characters made visible. */
    static String shown(String value) {
        if (value == null) {
            return "NULL";
        }
        String sb = DataText.visible(value);
        return "'" + (sb.length() > 60 ? sb.substring(0, 60) + "..." : sb) + "'";
    }

    static String share(Double s) {
        return s == null ? "-" : String.format(Locale.ROOT, "%.1f%%", 100 * s);
    }
}
