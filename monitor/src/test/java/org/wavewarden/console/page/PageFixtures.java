package org.wavewarden.console.page;

import org.w3c.dom.Document;
import org.w3c.dom.Element;
import org.w3c.dom.NodeList;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.AlertView;
import org.wavewarden.review.ReviewAction;
import org.wavewarden.review.ReviewEntry;
import org.wavewarden.review.ReviewReason;
import org.wavewarden.review.Role;
import org.wavewarden.review.SignOff;
import org.wavewarden.store.ConsoleReads;

import javax.xml.parsers.DocumentBuilderFactory;
import javax.xml.xpath.XPathConstants;
import javax.xml.xpath.XPathFactory;
import java.io.ByteArrayInputStream;
import java.nio.charset.StandardCharsets;
import java.time.Instant;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.fail;

/**
 * Records for the pages, with data chosen to break a page that forgets to escape: every name, label, sentence and
 * note holds markup, quotes, an ampersand or a script URL. And a reader of the pages: the JDK's XML parser (the
 * pages are written well-formed), with XPath to find elements.
 */
final class PageFixtures {

    static final Instant AT = Instant.parse("2026-03-02T09:15:00Z");
    static final String TOKEN = "csrf-token-7f3a";

    static final String DATASET = "harrowmere<script>alert(1)</script>\"&'";
    static final String VARIABLE = "tenure\" onmouseover=\"alert(1)";
    static final String LABEL = "<img src=x onerror=alert(1)> Tenure & rent";
    static final String SENTENCE = "</p><script>alert(2)</script> share rose from 31% to 38% & more";
    static final String NOTE = "javascript:alert(3) <b>see the fieldwork log</b>";
    static final String ACTOR = "<i>ellen.marsh</i>";
    static final String WAVE = "2025-Q4'&";
    static final String AGAINST = "2025-Q3<x>";
    static final String SCRIPT_URL = "javascript:alert(4)";

    private PageFixtures() {
    }

    static Chrome chrome(Role role) {
        return new Chrome(ACTOR, role, TOKEN, "Alert 12 explained <b>now</b>.");
    }

    static Finding finding() {
        return new Finding(VARIABLE, LABEL, FindingKind.SHIFT, "chi-squared", 41.7, 0.00002, 0.0004,
                new Finding.Effect("Cramér's V", 0.21, 0.15, 0.27, 0.1), Verdict.MATERIAL, 1200L, 1180L, SENTENCE,
                null, 3.0, "categories - 1", 40, "BENJAMINI_HOCHBERG");
    }

    static ReviewEntry entry(long id, ReviewAction action, ReviewReason reason, String note, String untilWave) {
        return new ReviewEntry(id, 12, AT.plusSeconds(60 * id), ACTOR, action, reason, note, "console", untilWave,
                untilWave == null ? null : LocalDate.parse("2026-06-30"));
    }

    static AlertView alert(long id, AlertState state, String verdict) {
        return new AlertView(id, 7, DATASET, WAVE, AGAINST, VARIABLE, "SHIFT", verdict, SENTENCE, List.of(), AT,
                state, entry(id, state == AlertState.MUTED ? ReviewAction.MUTED : ReviewAction.OPENED,
                state == AlertState.MUTED ? ReviewReason.FIX_UPSTREAM : null, NOTE, null));
    }

    static ConsoleReads.FindingView findingView(AlertState state) {
        List<ReviewEntry> history = List.of(entry(1, ReviewAction.OPENED, null, null, null),
                entry(2, ReviewAction.EXPLAINED, ReviewReason.PLANNED_CHANGE, NOTE, null),
                entry(3, ReviewAction.MUTED, ReviewReason.FIX_UPSTREAM, NOTE, "2026-Q2<y>"));
        List<ConsoleReads.TrendPoint> trend = List.of(
                new ConsoleReads.TrendPoint("2025-Q2", 101, "STABLE", "Cramér's V", 0.02, 0.0, 0.06, 0.1,
                        "share owning", 0.31, 0.29, 0.33),
                new ConsoleReads.TrendPoint(AGAINST, 102, "UNCERTAIN", "Cramér's V", 0.05, 0.0, 0.12, 0.1,
                        "share owning", 0.32, 0.30, 0.34),
                new ConsoleReads.TrendPoint(WAVE, 103, "MATERIAL", "Cramér's V", 0.21, 0.15, 0.27, 0.1,
                        "share owning", 0.38, 0.36, 0.40));
        return new ConsoleReads.FindingView(103, 7, DATASET, WAVE, AGAINST, finding(),
                state == null ? null : alert(12, state, "MATERIAL"), state == null ? List.of() : history, trend);
    }

    static ConsoleReads.WaveView waveView() {
        List<AlertView> alerts = List.of(alert(12, AlertState.OPEN, "MATERIAL"),
                alert(13, AlertState.EXPLAINED, "UNCERTAIN"), alert(14, AlertState.MUTED, null),
                alert(15, AlertState.SUPERSEDED, "MINOR"));
        SignOff forced = new SignOff(1, DATASET, WAVE, "rev<2>", ACTOR, AT, 7, "fp&1", "1.4.0", true,
                "press deadline <b>", alerts);
        return new ConsoleReads.WaveView(DATASET, WAVE, AGAINST, 7, AT, "fp&1", "1.4.0<tool>", 240, alerts,
                List.of(forced));
    }

    static ConsoleReads.DatasetSummary summary() {
        SignOff so = new SignOff(1, DATASET, WAVE, "", ACTOR, AT, 7, "fp", "1.4.0", false, null, List.of());
        return new ConsoleReads.DatasetSummary(DATASET, WAVE, AT, 12, Map.of("MATERIAL", 2, "UNCERTAIN", 3,
                "MINOR", 1, "none", 4), Map.of(AlertState.EXPLAINED, 5, AlertState.MUTED, 1), so, true);
    }

    static OverviewRow overviewRow() {
        return new OverviewRow(summary(), "0 15 6 * * ?", "last firing failed: " + SENTENCE);
    }

    /** {@code variables} x {@code waves.size()} cells; every third cell empty, the rest cycling through verdicts. */
    static ConsoleReads.Grid grid(int variables, List<String> waves) {
        String[] verdicts = {"MATERIAL", "UNCERTAIN", null, "MINOR", "STABLE", "CLEARED"};
        AlertState[] states = {AlertState.OPEN, null, AlertState.MUTED, AlertState.EXPLAINED, null};
        List<ConsoleReads.GridRow> rows = new ArrayList<>();
        long id = 1;
        for (int v = 0; v < variables; v++) {
            List<ConsoleReads.GridCell> cells = new ArrayList<>();
            for (int w = 0; w < waves.size(); w++) {
                int k = v * waves.size() + w;
                cells.add(k % 3 == 2 ? ConsoleReads.GridCell.EMPTY : new ConsoleReads.GridCell(id++,
                        k % 2 == 0 ? "SHIFT" : "BLANK", verdicts[k % verdicts.length], 1 + k % 4,
                        states[k % states.length]));
            }
            rows.add(new ConsoleReads.GridRow(v == 0 ? VARIABLE : "v" + v, v == 0 ? LABEL : "Label " + v, cells));
        }
        return new ConsoleReads.Grid(DATASET, waves, rows, List.of("SHIFT", "BLANK", "NOT_A_KIND<z>"));
    }

    static ConsoleReads.SearchHit hit() {
        return new ConsoleReads.SearchHit(DATASET, VARIABLE, LABEL, WAVE, 103, "MATERIAL");
    }

    /** Every page kind, rendered for {@code role}, by name. */
    static Map<String, String> everyPage(Role role) {
        Chrome c = chrome(role);
        return Map.of(
                "overview", Pages.overview(c, List.of(overviewRow())),
                "grid", Pages.grid(c, grid(4, List.of("2025-Q2", AGAINST, WAVE)),
                        new ConsoleReads.GridFilter("SHIFT", "MATERIAL")),
                "finding", Pages.finding(c, findingView(AlertState.MUTED)),
                "wave", Pages.wave(c, waveView(), "a MATERIAL alert is open: " + SENTENCE),
                "search", Pages.search(c, SENTENCE, List.of(hit())),
                "login", Pages.login(TOKEN, "Name or password <b>wrong</b>.", "/console/wave?dataset=a&wave=b"),
                "problem", Pages.problem(c, 409, "refused: " + SENTENCE));
    }

    static Document parse(String html) {
        try {
            DocumentBuilderFactory f = DocumentBuilderFactory.newInstance();
            f.setFeature("http://apache.org/xml/features/disallow-doctype-decl", false);
            f.setExpandEntityReferences(false);
            return f.newDocumentBuilder().parse(new ByteArrayInputStream(html.getBytes(StandardCharsets.UTF_8)));
        } catch (Exception e) {
            return fail("the page is not well-formed: " + e.getMessage() + "\n" + html);
        }
    }

    static List<Element> select(Document d, String xpath) {
        try {
            NodeList nodes = (NodeList) XPathFactory.newInstance().newXPath().evaluate(xpath, d,
                    XPathConstants.NODESET);
            List<Element> out = new ArrayList<>();
            for (int i = 0; i < nodes.getLength(); i++) {
                out.add((Element) nodes.item(i));
            }
            return out;
        } catch (javax.xml.xpath.XPathExpressionException e) {
            throw new IllegalArgumentException(xpath, e);
        }
    }

    static Element byId(Document d, String id) {
        List<Element> found = select(d, "//*[@id='" + id + "']");
        return found.size() == 1 ? found.get(0) : fail("expected one #" + id + ", found " + found.size());
    }
}
