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

/** The demo's own HTML digest, opened in headless Chromium: every alert is on the page with its plot. */
class DemoDigestBrowserTest {

    @TempDir
    Path dir;

    @Test
    void everyAlertOfTheDemoDigestRendersWithItsPlot() throws Exception {
        DemoRun.Outcome outcome = DemoRun.run(dir.resolve("demo"), new PrintWriter(new StringWriter()));
        Path page = outcome.outDir().resolve("digest.html");
        long alerts = outcome.reports().stream().map(FindingsReport::findings).mapToLong(f -> Alerts.select(f).size())
                .sum();
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
        assertEquals(alerts, articles.size(), "one article per alert");
        for (String a : articles) {
            assertTrue(a.contains("class=\"plot"), "an alert without its plot: " + a.substring(0, Math.min(300,
                    a.length())));
        }
        assertTrue(dom.contains("screening aids, not findings"));
        assertTrue(Files.size(page) > 10_000);
    }
}
