package org.wavewarden.deliver.html;

import org.junit.jupiter.api.Test;
import org.wavewarden.deliver.Alert;
import org.wavewarden.deliver.Alerts;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;

import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** One card per event in the HTML digest: the lead names the card and draws its chart, the other findings listed. */
class AlertCardFacetsTest {

    private static final Pattern ARTICLE = Pattern.compile("<article class=\"alert[^>]*>.*?</article>", Pattern.DOTALL);
    private static final Pattern FACET = Pattern.compile("<li class=\"facet\" data-kind=\"([A-Z_]+)\"");

    static String page(List<Finding> findings) {
        FindingsReport r = new FindingsReport("household", "2025-Q1", "2024-Q4", DigestFixtures.AT, 0.05,
                "BENJAMINI_HOCHBERG", List.of(), findings);
        List<AlertView> views = new ArrayList<>();
        for (Alert a : Alerts.group(findings)) {
            views.add(new AlertView(a, null, null));
        }
        return HtmlDigest.render("household", List.of(new WaveSection(r, views)), DigestFixtures.AT);
    }

    static List<String> articles(String html) {
        List<String> out = new ArrayList<>();
        Matcher m = ARTICLE.matcher(html);
        while (m.find()) {
            out.add(m.group());
        }
        return out;
    }

    @Test
    void aSentinelAndItsMissingRateChangeAreOneCardLedByTheVerdictWithTheSentinelListedInside() {
        Finding rate = new Finding("height_cm", FindingKind.MISSING_RATE_CHANGE, "two-proportion z", 5.1, 1e-6, 1e-5,
                new Finding.Effect("Cohen's h", 0.45, 0.3, 0.6, 0.2), Verdict.MATERIAL, 400L, 400L,
                "Missing answers rose from 0.0% to 12.5%.", null);
        Finding sentinel = Finding.dataQuality("height_cm", FindingKind.NUMERIC_SENTINEL, 400L, 400L,
                "50 answers are 999, a code for no answer <b>not</b> a height.", null);
        Finding other = DigestFixtures.shift("income", Verdict.UNCERTAIN, 0.1, -0.01, 0.2, 0.147, "Cliff's delta",
                "Incomes may have risen.");
        String html = page(List.of(sentinel, other, rate));
        List<String> cards = articles(html);
        assertEquals(2, cards.size(), html);
        String height = cards.get(0);
        assertTrue(height.contains("data-variable=\"height_cm\" data-kind=\"MISSING_RATE_CHANGE\""), height);
        Matcher m = FACET.matcher(height);
        List<String> listed = new ArrayList<>();
        while (m.find()) {
            listed.add(m.group(1));
        }
        assertEquals(List.of("NUMERIC_SENTINEL"), listed);
        assertTrue(height.contains("a code for no answer &lt;b&gt;not&lt;/b&gt; a height."), "data stays text");
        assertTrue(html.contains("alerts shown <b>2</b>"), "the wave counts events, not findings");
        assertFalse(cards.get(1).contains("class=\"facets\""), "an alert of one finding lists no facets");
    }
}
