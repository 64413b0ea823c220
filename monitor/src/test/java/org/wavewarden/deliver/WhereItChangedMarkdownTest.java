package org.wavewarden.deliver;

import org.commonmark.ext.gfm.tables.TableCell;
import org.commonmark.ext.gfm.tables.TableRow;
import org.commonmark.node.Node;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.domain.Breakdown;
import org.wavewarden.compare.domain.DomainChange;
import org.wavewarden.compare.domain.DomainMeasure;
import org.wavewarden.judge.Finding;

import java.time.Instant;
import java.util.ArrayList;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The Markdown digest's "Where it changed": below the alert table, per alerted finding with breakdowns a heading and
 * per column a table of the domains, with every hostile domain label, column name and measure inert text.
 */
class WhereItChangedMarkdownTest {

    @Test
    void eachBreakdownIsATableOfItsDomainsAndTheDataStayText() {
        List<DomainChange> domains = new ArrayList<>();
        for (String label : HostileLabelsTest.HOSTILE) {
            domains.add(new DomainChange(label, 100, 90, 0.5, 0.4, -0.1, 0.05, -0.2, 0.0, 0.04, 0.2, 0.1, 0.1,
                    -0.01));
        }
        String column = "a | b <script>x</script>";
        Breakdown b = new Breakdown(column, "v", "mean", DomainMeasure.Kind.MEAN, "cm", "unweighted", domains, -0.1,
                0.0, 7.5, domains.size() - 1, 0.9, 0.95, -0.1, List.of("[x](javascript:alert(1))"), 0, 0, 0);
        Finding f = HostileLabelsTest.shift("height_cm", "The mean fell.").withBreakdowns(List.of(b));
        FindingsReport report = new FindingsReport("harrowmere-household", "2025-Q2", "2025-Q1",
                Instant.parse("2025-07-01T06:15:00Z"), 0.05, "BENJAMINI_HOCHBERG", List.of(), List.of(f));
        String md = MarkdownDigest.render(List.of(report));
        Node doc = HostileLabelsTest.PARSER.parse(md);
        HostileLabelsTest.Census census = new HostileLabelsTest.Census();
        doc.accept(census);
        assertEquals(List.of(), census.live, "live markup from data");
        assertEquals(List.of(1, 2, 3, 2), census.headingLevels, "title, wave, where it changed, cautions");
        assertTrue(census.headingTexts.contains("Where it changed: height_cm, MATERIAL SHIFT"), census.headingTexts
                .toString());
        assertEquals(2, census.tables, "the alert table and the breakdown's");
        List<TableRow> domainRows = census.rows.stream().filter(r -> count(r) == 8).toList();
        // the heading row and one row per domain, each of eight cells
        assertEquals(1 + domains.size(), domainRows.size(), md);
        for (String label : HostileLabelsTest.HOSTILE) {
            assertTrue(census.cellTexts.contains(DataText.visible(label)), "shows as written: " + label);
        }
        assertTrue(census.cellTexts.contains("\u22120.100 (\u22120.200 to +0.000)"), census.cellTexts.toString());
        assertTrue(md.contains("differ across a \\| b \\<script\\>x\\</script\\>s?"), md);
    }

    private static int count(TableRow row) {
        int n = 0;
        for (Node c = row.getFirstChild(); c != null; c = c.getNext()) {
            if (c instanceof TableCell) {
                n++;
            }
        }
        return n;
    }
}
