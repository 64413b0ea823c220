package org.wavewarden.console.page;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.EnumSource;
import org.w3c.dom.Document;
import org.w3c.dom.Element;
import org.wavewarden.review.Role;
import org.wavewarden.store.ConsoleReads;
import org.wavewarden.store.ReleaseComparisons;

import java.time.Instant;
import java.util.List;
import java.util.Locale;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.wavewarden.console.page.PageFixtures.byId;
import static org.wavewarden.console.page.PageFixtures.parse;
import static org.wavewarden.console.page.PageFixtures.select;

/**
 * The wave page's release comparison: which publications were compared, when, with what counts, and the latest
 * comparison's {@code releases.md} shown as text. The Markdown carries variable names, release labels and cell
 * values from the data, so a hostile one must arrive on the page as the same characters and never as markup.
 */
class ReleaseComparisonSectionTest {

    /** A releases.md whose labels and examples try to become markup, a script link and an event handler. */
    static final String MARKDOWN = "# Wavewarden release comparison\n\n"
            + "## harrowmere: wave 2025-Q4, release <b>2</b> against release 1\n\n"
            + "| variable | changed | of | share | value to NULL | NULL to value | examples (key: before → after) |\n"
            + "|---|---:|---:|---:|---:|---:|---|\n"
            + "| tenure\" onmouseover=\"alert(1) | 3 | 400 | 0.75% | 0 | 1 | 17: <script>alert(2)</script> → "
            + "[x](javascript:alert(3)) & co |\n";

    static ReleaseComparisons.Stored comparison(long id, String release, String against, Instant at) {
        return new ReleaseComparisons.Stored(id, PageFixtures.DATASET, PageFixtures.WAVE, release, against, at,
                "1.4.0<tool>", 400, 402, 398, 4, 2, 3980, 7, 3, "{}", MARKDOWN);
    }

    static ConsoleReads.WaveView compared(ReleaseComparisons.Stored... comparisons) {
        ConsoleReads.WaveView w = PageFixtures.waveView();
        return new ConsoleReads.WaveView(w.dataset(), w.wave(), w.againstWave(), w.runId(), w.judgedAt(),
                w.configFingerprint(), w.toolVersion(), w.findings(), w.alerts(), w.signOffs(), w.leadFinding(),
                List.of(comparisons));
    }

    static final Instant FIRST = Instant.parse("2026-03-02T09:15:00Z");
    static final Instant SECOND = Instant.parse("2026-03-09T14:40:00Z");

    @ParameterizedTest
    @EnumSource(Role.class)
    void theMarkdownIsShownAsTheSameCharactersAndNeverAsMarkup(Role role) {
        String html = Pages.wave(PageFixtures.chrome(role), compared(comparison(2, "release <b>2</b>",
                "release 1\" onclick=\"x", SECOND)), null);
        String lower = html.toLowerCase(Locale.ROOT);
        assertFalse(lower.contains("<script") || lower.contains("<b>") || lower.contains("onmouseover=\"alert"),
                "data became markup");
        Document d = parse(html);
        Element pre = byId(d, "release-markdown");
        assertEquals("pre", pre.getTagName());
        assertEquals(MARKDOWN, pre.getTextContent(), "the Markdown arrives intact, as text");
        assertTrue(select(d, "//*[@id='release-markdown']//*").isEmpty(), "no element inside the Markdown");
        assertTrue(select(d, "//script|//a[starts-with(@href, 'javascript')]|//*[@onclick]|//*[@onmouseover]")
                .isEmpty());
        List<Element> cells = select(d, "//table[@id='release-comparisons']/tbody/tr/td");
        assertEquals("release <b>2</b>", cells.get(0).getTextContent());
        assertEquals("release 1\" onclick=\"x", cells.get(1).getTextContent());
    }

    @Test
    void eachComparisonIsARowWithItsCountsLatestFirst() {
        Document d = parse(Pages.wave(PageFixtures.chrome(Role.VIEWER),
                compared(comparison(5, "release 3", "release 2", SECOND), comparison(4, "release 2", "release 1",
                        FIRST)), null));
        List<Element> rows = select(d, "//table[@id='release-comparisons']/tbody/tr");
        assertEquals(2, rows.size());
        List<String> first = select(d, "//table[@id='release-comparisons']/tbody/tr[1]/td").stream()
                .map(Element::getTextContent).toList();
        // release, against, when, rows before, rows after, matched, added, removed, cells compared, cells changed,
        // variables changed, tool version
        assertEquals(List.of("release 3", "release 2"), first.subList(0, 2));
        assertTrue(first.get(2).contains("2026-03-09"), first.get(2));
        assertEquals(List.of("400", "402", "398", "4", "2", "3980", "7", "3"), first.subList(3, 11));
        assertEquals("1.4.0<tool>", first.get(11));
        assertEquals(12, select(d, "//table[@id='release-comparisons']//th[@scope='col']").size());
    }

    @Test
    void theLinksFetchBothFilesOfTheLatestComparisonFromTheConsole() {
        Document d = parse(Pages.wave(PageFixtures.chrome(Role.VIEWER),
                compared(comparison(2, "release 2", "release 1", SECOND)), null));
        List<String> hrefs = select(d, "//section[@id='release-comparison']//a").stream()
                .map(a -> a.getAttribute("href")).toList();
        String where = "/console/download?dataset=" + Pages.q(PageFixtures.DATASET) + "&wave="
                + Pages.q(PageFixtures.WAVE) + "&file=";
        assertEquals(List.of(where + "releases.md", where + "releases.json"), hrefs);
    }

    @Test
    void aWavePublishedOnceHasNoReleaseSection() {
        Document d = parse(Pages.wave(PageFixtures.chrome(Role.VIEWER), PageFixtures.waveView(), null));
        assertTrue(select(d, "//*[@id='release-comparison']").isEmpty());
    }
}
