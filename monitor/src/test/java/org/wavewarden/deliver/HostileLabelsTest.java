package org.wavewarden.deliver;

import org.commonmark.ext.gfm.tables.TableBlock;
import org.commonmark.ext.gfm.tables.TableCell;
import org.commonmark.ext.gfm.tables.TableRow;
import org.commonmark.ext.gfm.tables.TablesExtension;
import org.commonmark.node.AbstractVisitor;
import org.commonmark.node.Code;
import org.commonmark.node.CustomBlock;
import org.commonmark.node.CustomNode;
import org.commonmark.node.Emphasis;
import org.commonmark.node.Heading;
import org.commonmark.node.HtmlBlock;
import org.commonmark.node.HtmlInline;
import org.commonmark.node.Image;
import org.commonmark.node.Link;
import org.commonmark.node.Node;
import org.commonmark.node.StrongEmphasis;
import org.commonmark.node.Text;
import org.commonmark.parser.Parser;
import org.commonmark.renderer.html.HtmlRenderer;
import org.junit.jupiter.api.Test;
import org.wavewarden.codebook.CodeLabels;
import org.wavewarden.compare.release.ReleaseRevision;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;

import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Data is never markup: labels, variable names and category values written to look like HTML, Markdown links,
 * images, headings, code or table syntax come out of the Markdown digest and the console as inert text.
 */
class HostileLabelsTest {

    static final List<String> HOSTILE = List.of(
            "<script>alert(1)</script>",
            "![x](http://evil.example/pixel.png)",
            "[click me](javascript:alert(1))",
            "w1\n# Injected heading",
            "`rm -rf` and ``two``",
            "a | b | c",
            "<img src=x onerror=alert(1)>",
            "**bold** _em_ ~~gone~~",
            "&lt;script&gt; &#60;b&#62;",
            "<http://autolink.example>",
            "# at the start",
            "- a list?",
            "1. numbered",
            "> quoted",
            "trailing backslash \\",
            "tab\there, return\rthere, bell\u0007, override\u202Eevil, separator\u2028end");

    static final Parser PARSER = Parser.builder().extensions(List.of(TablesExtension.create())).build();

    static Finding shift(String variable, String sentence) {
        return new Finding(variable, FindingKind.SHIFT, "Pearson chi-square", 50.0, 1e-9, 1e-8,
                new Finding.Effect("Cram\u00e9r's V", 0.3, 0.2, 0.4, 0.1), Verdict.MATERIAL, 400L, 400L, sentence,
                null);
    }

    static FindingsReport hostileReport(String label) {
        List<Finding> findings = new ArrayList<>();
        for (String h : HOSTILE) {
            findings.add(shift(h, "Share answering '" + h + "' rose from 7.8% to 78.5% (+70.7 points)."));
        }
        findings.add(Finding.dataQuality(label, FindingKind.PLACEHOLDER, 400L, 400L, label, null));
        return new FindingsReport(label, label, label, Instant.parse("2025-07-01T06:15:00Z"), 0.05,
                "BENJAMINI_HOCHBERG", List.of(), findings);
    }

    @Test
    void theMarkdownDigestRendersEveryHostileStringAsTextAndNothingElse() {
        List<FindingsReport> reports = new ArrayList<>();
        for (String h : HOSTILE) {
            reports.add(hostileReport(h));
        }
        String md = MarkdownDigest.render(reports);
        Node doc = PARSER.parse(md);
        Census census = new Census();
        doc.accept(census);
        assertEquals(List.of(), census.live, "live markup from data");
        // Ours: the title, one section per report, the cautions; the one quote under the title.
        List<Integer> levels = new ArrayList<>(List.of(1));
        reports.forEach(r -> levels.add(2));
        levels.add(2);
        assertEquals(levels, census.headingLevels, md);
        assertEquals(1, census.blockQuotes, md);
        assertEquals(reports.size(), census.tables, md);
        // Ours: the quote's lead and **MATERIAL** on each verdict row, nothing else bold.
        assertEquals(1 + reports.size() * HOSTILE.size(), census.strong, md);
        for (TableRow row : census.rows) {
            assertEquals(3, count(row, TableCell.class), "a row of three cells: " + text(row));
        }
        for (String h : HOSTILE) {
            assertTrue(census.cellTexts.contains(DataText.visible(h)), "the variable shows as written: "
                    + DataText.visible(h));
            assertTrue(census.headingTexts.contains(DataText.visible(h) + ": wave " + DataText.visible(h) + " against "
                    + DataText.visible(h)), "the section heading shows the labels as written: " + census.headingTexts);
        }
        String html = HtmlRenderer.builder().extensions(List.of(TablesExtension.create())).build().render(doc);
        for (String tag : List.of("<script", "<img", "<a ", "<h3", "<h4", "<h5", "<h6", "<code", "<em", "<del",
                "<ol", "<li><h")) {
            assertFalse(html.toLowerCase(Locale.ROOT).contains(tag), tag + " in\n" + html);
        }
        assertEquals(1, Pattern.compile("<h1>").matcher(html).results().count(), html);
        assertEquals(1, Pattern.compile("<blockquote>").matcher(html).results().count(), html);
    }

    @Test
    void theReleaseDigestEscapesTheSameWay() {
        String h = "[x](javascript:alert(1)) <script>x</script>\n# owned";
        ReleaseRevision revision = new ReleaseRevision(10, 10, 10, 0, 0, List.of(h), List.of(h), null, null,
                List.of(new ReleaseRevision.VariableChanges(h, 10, 1, 0, 0, 0.1,
                        List.of(new ReleaseRevision.CellChange(h, h, "![i](http://evil.example/i.png)")))),
                List.of(), List.of(shift(h, "Share answering '" + h + "' rose.")), List.of(h));
        ReleaseReport report = new ReleaseReport("pub", h, "release column", h, h, "id",
                Instant.parse("2025-07-01T06:15:00Z"), 0.05, "BENJAMINI_HOCHBERG", List.of(h), List.of(h), revision,
                Cautions.LINES);
        Node doc = PARSER.parse(ReleaseDigest.markdown(report));
        Census census = new Census();
        doc.accept(census);
        assertEquals(List.of(), census.live, "live markup from data");
        assertEquals(List.of(1, 2, 3, 3, 2), census.headingLevels, "title, section, two sub-sections, cautions");
        assertEquals(1, census.blockQuotes);
        assertTrue(census.headingTexts.contains("pub: wave " + DataText.visible(h) + ", " + DataText.visible(h)
                + " against " + DataText.visible(h)), census.headingTexts.toString());
    }

    @Test
    void aConsoleRowStaysOneLineWhateverTheLabelHolds() {
        for (String h : HOSTILE) {
            FindingsReport r = hostileReport(h);
            String table = ConsoleTable.render(r, true);
            // A header line, the column titles, one line per finding.
            assertEquals(2 + r.findings().size(), table.lines().count(), table);
            assertFalse(table.chars().anyMatch(c -> c != '\n' && (Character.isISOControl(c)
                    || Character.getType(c) == Character.FORMAT || Character.getType(c) == Character.LINE_SEPARATOR)),
                    table);
        }
        String table = ConsoleTable.render(hostileReport("w1\nw2"), true);
        assertTrue(table.startsWith("w1\\nw2 wave w1\\nw2 against w1\\nw2\n"), table);
    }

    /** Hostile strings with a very long one, as variable labels and value labels. */
    static final List<String> HOSTILE_LABELS = java.util.stream.Stream.concat(HOSTILE.stream(),
            java.util.stream.Stream.of("\u202E" + "x".repeat(5_000) + "\n</td><script>")).toList();

    /**
     * A report whose findings each carry a hostile variable label and a sentence naming a code by a hostile value
     * label, as the comparators write it ({@link CodeLabels#quoted}).
     */
    static FindingsReport labelledReport() {
        List<Finding> findings = new ArrayList<>();
        int i = 0;
        for (String h : HOSTILE_LABELS) {
            CodeLabels labels = new CodeLabels(h, java.util.Map.of("C" + i, h));
            findings.add(shift("v" + i, "Share answering " + labels.quoted("C" + i) + " rose from 7.8% to 78.5%.")
                    .withLabel(h));
            i++;
        }
        return new FindingsReport("d", "w2", "w1", Instant.parse("2025-07-01T06:15:00Z"), 0.05,
                "BENJAMINI_HOCHBERG", List.of(), findings);
    }

    @Test
    void aSentenceShowsAHostileValueLabelOnOneLineWithoutControlsAndCut() {
        for (Finding f : labelledReport().findings()) {
            String s = f.sentence();
            assertFalse(s.chars().anyMatch(c -> Character.isISOControl(c) || Character.getType(c) == Character.FORMAT
                    || Character.getType(c) == Character.LINE_SEPARATOR), s);
            assertTrue(s.length() < 200, "a long label is cut in the sentence: " + s.length());
        }
    }

    @Test
    void hostileVariableAndValueLabelsStayTextInTheMarkdownDigest() {
        FindingsReport r = labelledReport();
        Node doc = PARSER.parse(MarkdownDigest.render(List.of(r)));
        Census census = new Census();
        doc.accept(census);
        assertEquals(List.of(), census.live, "live markup from labels");
        assertEquals(1, census.tables);
        for (TableRow row : census.rows) {
            assertEquals(3, count(row, TableCell.class), "a row of three cells: " + text(row));
        }
        for (Finding f : r.findings()) {
            String shown = DataText.visible(CodeLabels.shown(f.label()));
            assertTrue(census.cellTexts.contains(f.variable() + " (" + shown + ")"),
                    "the variable label shows beside the name as a sentence shows it: " + shown);
        }
    }

    @Test
    void hostileVariableLabelsTakeOneConsoleLineEachWithoutControls() {
        FindingsReport r = labelledReport();
        String table = ConsoleTable.render(r, true);
        // A header line, the column titles, per finding its line and its variable's label under it.
        assertEquals(2 + 2L * r.findings().size(), table.lines().count(), table);
        assertFalse(table.chars().anyMatch(c -> c != '\n' && (Character.isISOControl(c)
                || Character.getType(c) == Character.FORMAT || Character.getType(c) == Character.LINE_SEPARATOR)),
                table);
        assertTrue(table.lines().allMatch(l -> l.length() <= 120), table);
    }

    @Test
    void hostileLabelsAreEscapedInTheHtmlDigestAndItsCharts() {
        FindingsReport r = labelledReport();
        List<org.wavewarden.deliver.html.AlertView> views = new ArrayList<>();
        int i = 0;
        for (Finding f : r.findings()) {
            String h = HOSTILE_LABELS.get(i++);
            var estimate = new org.wavewarden.compare.WaveEstimates.Estimate("C", h, 0.5, 0.4, 0.6);
            var plotted = new org.wavewarden.compare.WaveEstimates.Plotted("share answering 'C'",
                    org.wavewarden.compare.WaveEstimates.Estimator.SHARE, null, List.of(estimate), List.of(estimate),
                    null);
            views.add(new org.wavewarden.deliver.html.AlertView(f,
                    new org.wavewarden.deliver.html.VariablePlot.EstimatePlot("id" + i, plotted), null));
        }
        String html = org.wavewarden.deliver.html.HtmlDigest.render("d", List.of(
                new org.wavewarden.deliver.html.WaveSection(r, views)), Instant.parse("2025-07-01T06:15:00Z"));
        String lower = html.toLowerCase(Locale.ROOT);
        assertFalse(lower.contains("<script") || lower.contains("<img") || lower.contains("</td><"), html);
        assertTrue(html.contains("<span class=\"vlabel\">&lt;script&gt;alert(1)&lt;/script&gt;</span>"), html);
        assertTrue(html.contains("&lt;script&gt;alert(1)&lt;/script&gt; (C)"), "the chart names the category by its"
                + " label, escaped");
    }

    /** Every node the parser made, sorted into ours and live markup that only data could have produced. */
    static final class Census extends AbstractVisitor {
        final List<String> live = new ArrayList<>();
        final List<TableRow> rows = new ArrayList<>();
        final List<String> cellTexts = new ArrayList<>();
        final List<String> headingTexts = new ArrayList<>();
        final List<Integer> headingLevels = new ArrayList<>();
        int blockQuotes;
        int tables;
        int strong;

        @Override
        public void visit(Heading heading) {
            headingLevels.add(heading.getLevel());
            headingTexts.add(text(heading));
            visitChildren(heading);
        }

        @Override
        public void visit(HtmlInline html) {
            live.add("inline HTML " + html.getLiteral());
        }

        @Override
        public void visit(HtmlBlock html) {
            live.add("HTML block " + html.getLiteral());
        }

        @Override
        public void visit(Link link) {
            live.add("link to " + link.getDestination());
        }

        @Override
        public void visit(Image image) {
            live.add("image from " + image.getDestination());
        }

        @Override
        public void visit(Code code) {
            live.add("code span " + code.getLiteral());
        }

        @Override
        public void visit(Emphasis emphasis) {
            live.add("emphasis " + text(emphasis));
        }

        @Override
        public void visit(StrongEmphasis strong) {
            this.strong++;
            visitChildren(strong);
        }

        @Override
        public void visit(org.commonmark.node.BlockQuote quote) {
            blockQuotes++;
            visitChildren(quote);
        }

        @Override
        public void visit(org.commonmark.node.OrderedList list) {
            live.add("numbered list " + text(list));
        }

        @Override
        public void visit(CustomBlock block) {
            if (block instanceof TableBlock) {
                tables++;
            }
            visitChildren(block);
        }

        @Override
        public void visit(CustomNode node) {
            if (node instanceof TableRow row) {
                rows.add(row);
            }
            if (node instanceof TableCell cell) {
                cellTexts.add(text(cell));
            }
            visitChildren(node);
        }
    }

    static String text(Node node) {
        StringBuilder sb = new StringBuilder();
        node.accept(new AbstractVisitor() {
            @Override
            public void visit(Text text) {
                sb.append(text.getLiteral());
            }

            @Override
            public void visit(Code code) {
                sb.append(code.getLiteral());
            }
        });
        return sb.toString();
    }

    static int count(Node parent, Class<?> type) {
        int n = 0;
        for (Node c = parent.getFirstChild(); c != null; c = c.getNext()) {
            n += type.isInstance(c) ? 1 : 0;
        }
        return n;
    }
}
