package org.wavewarden.console.page;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.deliver.FindingsFiles;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.deliver.MarkdownDigest;
import org.wavewarden.deliver.html.AlertView;
import org.wavewarden.deliver.html.HtmlDigest;
import org.wavewarden.deliver.html.WaveSection;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;
import org.wavewarden.review.Role;
import org.wavewarden.store.ConsoleReads;

import java.nio.file.Path;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A reader sees which baseline a finding was judged against when the run judged several: the digest (HTML and
 * Markdown), the console's finding page and findings.json say "against 2024-Q2, 4 waves back", and link the
 * baseline wave itself rather than the run's key of all its baselines.
 */
class BaselineShownTest {

    static final String DATASET = "harrowmere-household";
    static final String RUN_KEY = "2025-Q1 + 2024-Q2 (4 waves back)";
    static final String SEASON = "2024-Q2 (4 waves back)";

    static Finding shift(String against) {
        Finding f = new Finding("heating_hours", FindingKind.SHIFT, "Welch t", -3.1, 0.002, 0.004,
                new Finding.Effect("difference in means", 6.0, 2.2, 9.8, 5.0), Verdict.MATERIAL, 800L, 800L,
                "Heating hours rose.", null);
        return against == null ? f : f.withAgainst(against);
    }

    static FindingsReport report(Finding... findings) {
        return new FindingsReport(DATASET, "2025-Q2", RUN_KEY, PageFixtures.AT, 0.05, "BENJAMINI_HOCHBERG",
                List.of(), List.of(findings));
    }

    @Test
    void theHtmlDigestNamesTheSeasonalBaselineOfAnAlert() {
        Finding seasonal = shift(SEASON);
        String html = HtmlDigest.render(DATASET, List.of(new WaveSection(report(shift(null), seasonal), List.of(
                new AlertView(shift(null), null, null), new AlertView(seasonal, null, null)))), PageFixtures.AT);
        assertTrue(html.contains("<span class=\"against\">against 2024-Q2, 4 waves back</span>"), html);
        assertEquals(1, html.split("class=\"against\"", -1).length - 1, "only the seasonal alert names a baseline");
    }

    @Test
    void theMarkdownDigestNamesIt() {
        String md = MarkdownDigest.render(List.of(report(shift(null), shift(SEASON))));
        assertTrue(md.contains("| heating\\_hours, against 2024-Q2, 4 waves back |"), md);
        assertTrue(md.contains("| heating\\_hours |"), md);
    }

    @Test
    void theConsoleFindingPageLinksTheFindingsOwnBaselineWave() {
        String seasonal = Pages.finding(PageFixtures.chrome(Role.VIEWER), new ConsoleReads.FindingView(5, 1, DATASET,
                "2025-Q2", RUN_KEY, shift(SEASON), null, List.of(), List.of()));
        assertTrue(seasonal.contains(">2024-Q2</a> (<span class=\"against\">4 waves back</span>)"), seasonal);
        String main = Pages.finding(PageFixtures.chrome(Role.VIEWER), new ConsoleReads.FindingView(6, 1, DATASET,
                "2025-Q2", RUN_KEY, shift(null), null, List.of(), List.of()));
        assertTrue(main.contains(">2025-Q1</a>"), main);
        assertFalse(main.contains("4 waves back"), main);
        PageFixtures.parse(seasonal);
    }

    @Test
    void findingsJsonCarriesTheBaseline(@TempDir Path dir) {
        Path json = FindingsFiles.write(dir, report(shift(null), shift(SEASON)));
        FindingsReport read = FindingsFiles.read(json);
        assertEquals(RUN_KEY, read.againstWave());
        assertEquals(java.util.Arrays.asList(null, SEASON), read.findings().stream().map(Finding::against).toList());
    }
}
