package org.wavewarden.console.page;

import org.junit.jupiter.api.Test;
import org.w3c.dom.Document;
import org.w3c.dom.Element;
import org.wavewarden.compare.domain.Breakdown;
import org.wavewarden.compare.domain.DomainChange;
import org.wavewarden.compare.domain.DomainMeasure;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.deliver.html.AlertView;
import org.wavewarden.deliver.html.HtmlDigest;
import org.wavewarden.deliver.html.WaveSection;
import org.wavewarden.judge.Finding;
import org.wavewarden.review.Role;
import org.wavewarden.store.ConsoleReads;

import java.util.ArrayList;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.wavewarden.console.page.PageFixtures.parse;
import static org.wavewarden.console.page.PageFixtures.select;

/**
 * A finding's "Where it changed" tables on the console's finding page and in the HTML digest: one table per
 * breakdown column, a row per domain in the breakdown's order, the test and what was not compared, and every domain
 * label, however hostile, shown as the text it is.
 */
class WhereItChangedPageTest {

    /** Domain labels written to look like markup (the control characters are the Markdown test's: HTML drops them). */
    static final List<String> HOSTILE = List.of("<script>alert(1)</script>", "\" onmouseover=\"alert(2)",
            "<img src=x onerror=alert(3)>", "&amp; &#60;b&#62;", "KES</td></tr></table><b>x</b>");

    static Breakdown hostileBreakdown(String column) {
        List<DomainChange> domains = new ArrayList<>();
        double contribution = 0.05;
        for (String label : HOSTILE) {
            domains.add(new DomainChange(label, 150, 160, 0.12, 0.30, 0.18, 0.03, 0.12, 0.24, 0.00001, 0.00005,
                    0.2, 0.2, contribution));
            contribution /= 2;
        }
        return new Breakdown(column, "owns_car", "share answering '<yes>'", DomainMeasure.Kind.SHARE, "points",
                "weighted (linearised, each respondent a PSU)", domains, 0.06, 0.001, 31.2, 4, 0.000003, 0.00002,
                0.01, List.of("<i>left</i>"), 12, 3, 45);
    }

    static Finding finding() {
        return PageFixtures.finding().withBreakdowns(List.of(hostileBreakdown("district<b>"),
                hostileBreakdown("interview_mode")));
    }

    @Test
    void theFindingPageShowsEachBreakdownAsATableWithTheDomainLabelsAsText() {
        ConsoleReads.FindingView view = new ConsoleReads.FindingView(5, 1, "harrowmere-household", "2025-Q2",
                "2025-Q1", finding(), null, List.of(), List.of());
        Document d = parse(Pages.finding(PageFixtures.chrome(Role.VIEWER), view));
        assertShowsAsText(d, "//section[@id='where']");
    }

    @Test
    void theHtmlDigestShowsTheSameTablesUnderTheAlertsNumbers() {
        Finding f = finding();
        FindingsReport report = new FindingsReport("harrowmere-household", "2025-Q2", "2025-Q1", PageFixtures.AT,
                0.05, "BENJAMINI_HOCHBERG", List.of(), List.of(f));
        String digest = HtmlDigest.render("harrowmere-household", List.of(new WaveSection(report,
                List.of(new AlertView(f, null, null)))), PageFixtures.AT);
        int from = digest.indexOf("<section class=\"where\">");
        assertTrue(from > digest.indexOf("<p class=\"stats\">"), "below the alert's numbers");
        String section = digest.substring(from, digest.indexOf("</section>", from) + "</section>".length());
        Document d = parse(section);
        assertShowsAsText(d, "/section");
        // The digest knows the run's alpha: the intervals' level is named and a differing breakdown is marked.
        assertTrue(select(d, "//table/thead/tr/th").stream().anyMatch(th -> th.getTextContent()
                .equals("change (points), 95% interval")));
        assertEquals(2, select(d, "//table[@data-differs='yes']").size());
    }

    private static void assertShowsAsText(Document d, String section) {
        List<Element> tables = select(d, section + "//table");
        assertEquals(2, tables.size(), "one table per breakdown column");
        assertEquals("district<b>", tables.get(0).getAttribute("data-column"));
        for (Element table : tables) {
            List<Element> rows = select(d, section + "//table[@data-column='" + table.getAttribute("data-column")
                    + "']/tbody/tr/th[@scope='row']");
            assertEquals(HOSTILE, rows.stream().map(Element::getTextContent).toList(), "ranked, as written");
            List<Element> first = select(d, section + "//table[@data-column='" + table.getAttribute("data-column")
                    + "']/tbody/tr[1]/td");
            assertEquals(List.of("150", "160", "12.0", "30.0", "+18.0 (+12.0 to +24.0)", "< 0.001", "+5.0"),
                    first.stream().map(Element::getTextContent).toList());
        }
        assertTrue(select(d, section + "//caption").get(0).getTextContent()
                .startsWith("Share answering '<yes>' by district<b>"));
        assertEquals(List.of(), select(d, section + "//script | " + section + "//img | " + section + "//b | "
                + section + "//i"), "no element from the data");
        assertEquals(List.of(), select(d, section + "//*[@style or @onmouseover or @onerror]"),
                "no inline style (the console's policy) and no handler from the data");
        String text = select(d, section).get(0).getTextContent();
        assertTrue(text.contains("Wald chi-square 31.20 on 4 df, p < 0.001, q < 0.001"), text);
        assertTrue(text.contains("3 further district<b> value(s) beyond the cap on domains (45 rows)"), text);
        assertTrue(text.contains("no answers in one of the waves: <i>left</i>."), text);
        assertTrue(text.contains("12 row(s) of 2025-Q2 have no interview mode"), text);
        assertFalse(text.contains("&lt;"), "escaped once, not twice");
    }
}
