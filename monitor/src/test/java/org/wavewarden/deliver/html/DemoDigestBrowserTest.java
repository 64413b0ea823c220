package org.wavewarden.deliver.html;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.deliver.Alerts;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.demo.DemoRun;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The demo's own HTML digests, the household survey's and the panel's, opened in headless Chromium: every alert is
 * on the page, each with its plot (a relationship change with both waves' correlations and their intervals).
 */
class DemoDigestBrowserTest {

    @TempDir
    Path dir;

    @Test
    void everyAlertOfBothDemoDigestsRendersWithItsPlot() throws Exception {
        DemoRun.Outcome outcome = DemoRun.run(dir.resolve("demo"), new PrintWriter(new StringWriter()));
        checkPage(outcome.outDir().resolve("digest.html"), outcome.reports());
        checkPage(outcome.outDir().resolve(DemoRun.PANEL_FOLDER).resolve("digest.html"), outcome.panelReports());
    }

    private void checkPage(Path page, List<FindingsReport> reports) throws Exception {
        long alerts = reports.stream().map(FindingsReport::findings).mapToLong(f -> Alerts.group(f).size()).sum();
        HtmlDigestBrowserTest.Run run = HtmlDigestBrowserTest.browse(page, dir, "--dump-dom");
        assertEquals(0, run.exit(), run.stderr());
        assertTrue(HtmlDigestBrowserTest.pageErrors(run.stderr()).isEmpty(), "page errors: "
                + HtmlDigestBrowserTest.pageErrors(run.stderr()));
        String dom = run.stdout();
        List<String> articles = new ArrayList<>();
        Matcher m = Pattern.compile("<article class=\"alert[^\"]*\"[^>]*>(.*?)</article>", Pattern.DOTALL).matcher(dom);
        while (m.find()) {
            articles.add(m.group(1));
        }
        assertEquals(alerts, articles.size(), page + ": one article per alert");
        for (String a : articles) {
            assertTrue(a.contains("class=\"plot"), page + ": an alert without its plot: "
                    + a.substring(0, Math.min(300, a.length())));
            if (a.contains("data-kind=\"RELATIONSHIP_CHANGE\"") || a.contains("The Spearman correlation of ")) {
                assertTrue(a.contains("class=\"plot correlation"), "a relationship alert draws its correlations");
            }
        }
        assertTrue(dom.contains("screening aids, not findings"));
        assertTrue(Files.size(page) > 10_000);
    }
}
