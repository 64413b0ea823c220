package org.wavewarden.console.page;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.params.provider.EnumSource;
import org.w3c.dom.Document;
import org.w3c.dom.Element;
import org.w3c.dom.NamedNodeMap;
import org.wavewarden.deliver.Cautions;
import org.wavewarden.deliver.html.HtmlDigest;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.Role;

import java.util.Arrays;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import java.util.stream.Collectors;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.wavewarden.console.page.PageFixtures.byId;
import static org.wavewarden.console.page.PageFixtures.parse;
import static org.wavewarden.console.page.PageFixtures.select;

/**
 * What every console page promises whoever renders it: data shown as text and never as markup, a CSRF token in every
 * form that changes something, a label for every control, nothing the content security policy would refuse, one
 * element per contract id, and only the forms the person's role allows.
 */
class ConsolePagesTest {

    @ParameterizedTest
    @EnumSource(Role.class)
    void everyPageIsWellFormedAndHasTheSharedFrame(Role role) {
        PageFixtures.everyPage(role).forEach((name, html) -> {
            Document d = parse(html);
            Element root = d.getDocumentElement();
            assertEquals("html", root.getTagName(), name);
            assertEquals("en", root.getAttribute("lang"), name);
            assertEquals("#main", select(d, "//a[@class='skip']").get(0).getAttribute("href"), name);
            assertEquals("main", byId(d, "main").getTagName(), name);
            assertEquals("/console", select(d, "//header//a[@class='brand']").get(0).getAttribute("href"), name);
            assertEquals(1, select(d, "//h1").size(), name + ": one h1");
            if (!name.equals("login")) {
                Element search = byId(d, "search-form");
                assertEquals("get", search.getAttribute("method"), name);
                assertEquals("/console/search", search.getAttribute("action"), name);
                assertEquals(1, select(d, "//form[@id='search-form']//input[@name='q']").size(), name);
                Element logout = byId(d, "logout-form");
                assertEquals("/console/logout", logout.getAttribute("action"), name);
                assertEquals("logout", select(d, "//form[@id='logout-form']//button").get(0).getAttribute("id"));
                assertEquals(PageFixtures.ACTOR, byId(d, "user").getTextContent(), name);
                assertEquals(role.key(), byId(d, "role").getTextContent(), name);
                Element notice = byId(d, "notice");
                assertEquals("status", notice.getAttribute("role"), name);
                assertEquals("Alert 12 explained <b>now</b>.", notice.getTextContent(), name);
            }
        });
    }

    @ParameterizedTest
    @EnumSource(Role.class)
    void dataIsShownAsTextAndNeverBecomesMarkupOrAScriptLink(Role role) {
        PageFixtures.everyPage(role).forEach((name, html) -> {
            String lower = html.toLowerCase(Locale.ROOT);
            assertFalse(lower.contains("<script") || lower.contains("<img") || lower.contains("<b>")
                    || lower.contains("<i>"), name + " lets data become markup");
            Document d = parse(html);
            for (Element e : select(d, "//*")) {
                NamedNodeMap attributes = e.getAttributes();
                for (int i = 0; i < attributes.getLength(); i++) {
                    String attribute = attributes.item(i).getNodeName().toLowerCase(Locale.ROOT);
                    String value = attributes.item(i).getNodeValue().toLowerCase(Locale.ROOT).strip();
                    assertFalse(attribute.startsWith("on"), name + ": event handler " + attribute);
                    assertFalse(attribute.equals("style"), name + ": a style attribute the policy would refuse");
                    // The one exception: the page's empty icon, so a browser asks no /favicon.ico (a 404 it logs).
                    boolean emptyIcon = e.getTagName().equals("link") && value.equals("data:,");
                    if (!emptyIcon && (attribute.equals("href") || attribute.equals("action")
                            || attribute.equals("src"))) {
                        assertTrue(value.startsWith("/console") || value.startsWith("#"),
                                name + ": a link outside the console: " + value);
                    }
                }
            }
            assertTrue(select(d, "//script|//style|//iframe|//object").isEmpty(), name);
        });
    }

    @Test
    void theHostileValuesArriveIntactAsText() {
        Document finding = parse(PageFixtures.everyPage(Role.STEWARD).get("finding"));
        assertEquals(PageFixtures.SENTENCE, byId(finding, "sentence").getTextContent());
        assertTrue(select(finding, "//h1").get(0).getTextContent().contains(PageFixtures.VARIABLE));
        assertTrue(select(finding, "//h1").get(0).getTextContent().contains(PageFixtures.LABEL));
        assertTrue(byId(finding, "history").getTextContent().contains(PageFixtures.NOTE));
        // The dataset's link carries the name URL-encoded, so its quotes and ampersand cannot end the attribute.
        assertEquals("/console/dataset?name=harrowmere%3Cscript%3Ealert%281%29%3C%2Fscript%3E%22%26%27",
                select(finding, "//p[@class='meta']/a").get(0).getAttribute("href"));
        assertEquals("/console/wave?dataset=harrowmere%3Cscript%3Ealert%281%29%3C%2Fscript%3E%22%26%27"
                + "&wave=2025-Q4%27%26", select(finding, "//p[@class='meta']/a").get(1).getAttribute("href"));

        Document search = parse(PageFixtures.everyPage(Role.VIEWER).get("search"));
        assertEquals(PageFixtures.SENTENCE, byId(search, "query").getTextContent());
        assertEquals(PageFixtures.SENTENCE, select(search, "//input[@name='q']").get(0).getAttribute("value"));

        Document login = parse(Pages.login(PageFixtures.TOKEN, null, PageFixtures.SCRIPT_URL + "\"><b>"));
        assertEquals(PageFixtures.SCRIPT_URL + "\"><b>",
                select(login, "//input[@name='next']").get(0).getAttribute("value"));
    }

    @ParameterizedTest
    @EnumSource(Role.class)
    void everyFormThatChangesSomethingCarriesTheToken(Role role) {
        PageFixtures.everyPage(role).forEach((name, html) -> {
            Document d = parse(html);
            for (Element form : select(d, "//form")) {
                String method = form.getAttribute("method");
                assertTrue(method.equals("get") || method.equals("post"), name + ": method " + method);
                if (method.equals("post")) {
                    List<Element> csrf = select(d, "//form[@id='" + form.getAttribute("id")
                            + "']//input[@type='hidden' and @name='csrf']");
                    assertEquals(1, csrf.size(), name + " #" + form.getAttribute("id"));
                    assertEquals(PageFixtures.TOKEN, csrf.get(0).getAttribute("value"), name);
                }
            }
        });
    }

    @ParameterizedTest
    @EnumSource(Role.class)
    void everyControlHasItsLabelAndEveryIdIsUnique(Role role) {
        PageFixtures.everyPage(role).forEach((name, html) -> {
            Document d = parse(html);
            List<String> ids = select(d, "//*[@id]").stream().map(e -> e.getAttribute("id")).toList();
            assertEquals(ids.size(), new HashSet<>(ids).size(), name + ": duplicate ids in " + ids);
            Set<String> labelled = select(d, "//label[@for]").stream().map(e -> e.getAttribute("for"))
                    .collect(Collectors.toSet());
            for (Element control : select(d, "//input[not(@type='hidden')]|//select|//textarea")) {
                assertTrue(labelled.contains(control.getAttribute("id")),
                        name + ": no label for " + control.getAttribute("name"));
            }
            for (Element table : select(d, "//table")) {
                assertFalse(select(d, "//table[@id='" + table.getAttribute("id") + "']//th[not(@scope)]").size()
                        > 0, name + ": a header cell without scope in #" + table.getAttribute("id"));
            }
        });
    }

    @Test
    void headingsDoNotSkipALevel() {
        PageFixtures.everyPage(Role.RELEASER).forEach((name, html) -> {
            int previous = 0;
            for (Element h : select(parse(html), "//h1|//h2|//h3|//h4")) {
                int level = h.getTagName().charAt(1) - '0';
                assertTrue(level <= previous + 1, name + ": " + h.getTagName() + " after h" + previous);
                previous = level;
            }
        });
    }

    /** Which action forms each role sees: a viewer none, a steward the alert's, a releaser also the sign-off. */
    @ParameterizedTest(name = "{0} on the {1} page: {2}")
    @CsvSource({
            "VIEWER,   finding-open,  ''",
            "STEWARD,  finding-open,  explain-form mute-form",
            "RELEASER, finding-open,  explain-form mute-form",
            "STEWARD,  finding-muted, explain-form mute-form unmute-form",
            "STEWARD,  finding-gone,  ''",
            "STEWARD,  finding-none,  ''",
            "VIEWER,   wave,          ''",
            "STEWARD,  wave,          ''",
            "RELEASER, wave,          signoff-form",
    })
    void theFormsFollowTheRole(Role role, String page, String expected) {
        Chrome c = PageFixtures.chrome(role);
        String html = switch (page) {
            case "finding-open" -> Pages.finding(c, PageFixtures.findingView(AlertState.OPEN));
            case "finding-muted" -> Pages.finding(c, PageFixtures.findingView(AlertState.MUTED));
            case "finding-gone" -> Pages.finding(c, PageFixtures.findingView(AlertState.SUPERSEDED));
            case "finding-none" -> Pages.finding(c, PageFixtures.findingView(null));
            default -> Pages.wave(c, PageFixtures.waveView(), null);
        };
        Set<String> forms = select(parse(html), "//form[@method='post']").stream().map(e -> e.getAttribute("id"))
                .filter(id -> !id.equals("logout-form")).collect(Collectors.toCollection(TreeSet::new));
        Set<String> want = Arrays.stream(expected.split(" ")).filter(s -> !s.isBlank())
                .collect(Collectors.toCollection(TreeSet::new));
        assertEquals(want, forms);
    }

    @Test
    void theStewardsFormsSendTheContractsFields() {
        Document d = parse(Pages.finding(PageFixtures.chrome(Role.STEWARD),
                PageFixtures.findingView(AlertState.MUTED)));
        assertEquals(fields("alert csrf note reason"), names(d, "explain-form"));
        assertEquals(fields("alert csrf note reason untilDate untilWave"), names(d, "mute-form"));
        assertEquals(fields("alert csrf note"), names(d, "unmute-form"));
        assertEquals("/console/alert/explain", byId(d, "explain-form").getAttribute("action"));
        assertEquals("/console/alert/mute", byId(d, "mute-form").getAttribute("action"));
        assertEquals("/console/alert/unmute", byId(d, "unmute-form").getAttribute("action"));
        assertEquals("12", select(d, "//form[@id='explain-form']//input[@name='alert']").get(0)
                .getAttribute("value"));
        assertEquals("date", select(d, "//input[@name='untilDate']").get(0).getAttribute("type"));
        assertEquals(List.of("planned-change", "fix-upstream", "real-change", "no-problem"),
                select(d, "//form[@id='explain-form']//option").stream().map(e -> e.getAttribute("value")).toList());
        assertTrue(select(d, "//form[@id='explain-form']//option").get(0).getTextContent()
                .contains("expected from a design, mode or questionnaire change"));

        Document w = parse(Pages.wave(PageFixtures.chrome(Role.RELEASER), PageFixtures.waveView(), null));
        assertEquals(fields("csrf dataset force reason release run wave"), names(w, "signoff-form"));
        assertEquals("/console/signoff", byId(w, "signoff-form").getAttribute("action"));
        assertEquals(PageFixtures.DATASET, select(w, "//form[@id='signoff-form']//input[@name='dataset']").get(0)
                .getAttribute("value"));
        assertEquals("checkbox", select(w, "//input[@name='force']").get(0).getAttribute("type"));

        Document login = parse(Pages.login(PageFixtures.TOKEN, null, "/console"));
        assertEquals(fields("csrf name next password"), names(login, "login-form"));
        assertEquals("current-password", select(login, "//input[@name='password']").get(0)
                .getAttribute("autocomplete"));
        assertEquals("password", select(login, "//input[@name='password']").get(0).getAttribute("type"));
        assertTrue(select(login, "//*[@id='login-error']").isEmpty(), "no error before a failed attempt");
    }

    private static Set<String> fields(String names) {
        return new TreeSet<>(Arrays.asList(names.split(" ")));
    }

    private static Set<String> names(Document d, String form) {
        return select(d, "//form[@id='" + form + "']//*[@name]").stream().map(e -> e.getAttribute("name"))
                .collect(Collectors.toCollection(TreeSet::new));
    }

    @Test
    void theOverviewRowSaysWhatTheDatasetNeeds() {
        Document d = parse(PageFixtures.everyPage(Role.VIEWER).get("overview"));
        List<Element> cells = select(d, "//table[@id='datasets']/tbody/tr[1]/*");
        List<String> text = cells.stream().map(Element::getTextContent).toList();
        assertEquals(List.of(PageFixtures.DATASET, PageFixtures.WAVE, "2026-03-02 09:15 UTC", "2", "3",
                "5", "5", "1", "✓ signed off by " + PageFixtures.ACTOR + " at 2026-03-02 09:15 UTC",
                "0 15 6 * * ?", "last firing failed: " + PageFixtures.SENTENCE), text);
        assertEquals("/console/wave?dataset=harrowmere%3Cscript%3Ealert%281%29%3C%2Fscript%3E%22%26%27"
                + "&wave=2025-Q4%27%26", select(d, "//table[@id='datasets']//td/a").get(0).getAttribute("href"));
    }

    @Test
    void aDatasetWithoutRunsOrSignOffSaysSo() {
        var s = new org.wavewarden.store.ConsoleReads.DatasetSummary("harrowmere-farms", null, null, 0, Map.of(),
                Map.of(), null, false);
        Document d = parse(Pages.overview(PageFixtures.chrome(Role.VIEWER), List.of(new OverviewRow(s, null,
                "no daemon runs this console"))));
        List<String> text = select(d, "//table[@id='datasets']/tbody/tr[1]/*").stream()
                .map(Element::getTextContent).toList();
        assertEquals(List.of("harrowmere-farms", "none yet", "never", "0", "0", "0", "0", "0", "not signed off",
                "none", "no daemon runs this console"), text);
    }

    @Test
    void theWavePageGroupsAlertsByStateAndRecordsEverySignOff() {
        Document d = parse(Pages.wave(PageFixtures.chrome(Role.VIEWER), PageFixtures.waveView(),
                "a MATERIAL alert is open"));
        for (String state : List.of("open", "explained", "muted", "superseded")) {
            assertEquals(1, select(d, "//section[@id='alerts-" + state + "']//li").size(), state);
        }
        assertEquals("alert", byId(d, "refusal").getAttribute("role"));
        assertTrue(byId(d, "refusal").getTextContent().contains("a MATERIAL alert is open"));
        List<String> record = select(d, "//table[@id='signoff-record']/tbody/tr[1]/td").stream()
                .map(Element::getTextContent).toList();
        assertEquals(List.of(PageFixtures.ACTOR, "2026-03-02 09:15 UTC", "rev<2>", "forced: press deadline <b>", "7",
                "1 open, 1 explained, 1 muted, 1 superseded"), record);
        assertEquals(List.of(
                        "/console/download?dataset=harrowmere%3Cscript%3Ealert%281%29%3C%2Fscript%3E%22%26%27"
                                + "&wave=2025-Q4%27%26&file=findings.json",
                        "/console/download?dataset=harrowmere%3Cscript%3Ealert%281%29%3C%2Fscript%3E%22%26%27"
                                + "&wave=2025-Q4%27%26&file=digest.md"),
                select(d, "//section[@id='downloads']//a").stream().map(e -> e.getAttribute("href")).toList());
        // Without the alerts' lead findings, an alert links to the grid filtered to its kind.
        assertTrue(select(d, "//section[@id='alerts-open']//a").get(0).getAttribute("href")
                .endsWith("&kind=SHIFT"));
        Document linked = parse(Pages.wave(PageFixtures.chrome(Role.VIEWER), PageFixtures.waveView(), null,
                Map.of(12L, 103L)));
        assertEquals("/console/finding?id=103", select(linked, "//section[@id='alerts-open']//a").get(0)
                .getAttribute("href"));
        assertTrue(select(linked, "//*[@id='refusal']").isEmpty());
    }

    @Test
    void theFindingPageCarriesTheCautionsAndTheNumbers() {
        Document d = parse(Pages.finding(PageFixtures.chrome(Role.VIEWER), PageFixtures.findingView(AlertState.OPEN)));
        List<String> cautions = select(d, "//aside[@id='cautions']//li").stream().map(Element::getTextContent)
                .toList();
        assertEquals(Cautions.LINES, cautions);
        Map<String, String> numbers = numbers(d);
        assertEquals("chi-squared", numbers.get("Test"));
        assertEquals("41.70", numbers.get("Statistic"));
        assertEquals("3.000 (categories - 1)", numbers.get("Degrees of freedom"));
        assertEquals("< 0.0001", numbers.get("p"));
        assertEquals("= 0.0004 (BENJAMINI_HOCHBERG, 40 p-values)", numbers.get("q"));
        assertEquals("Cramér's V +0.210, interval +0.150 to +0.270", numbers.get("Effect"));
        assertEquals("±0.100", numbers.get("Threshold"));
        // A measure from 0 up: its smallest detectable change is the interval's whole width (Finding.Effect).
        assertEquals("±0.120 (too few answers to resolve the threshold)", numbers.get("Smallest detectable change"));
        assertEquals("1200", numbers.get("n, " + PageFixtures.AGAINST));
        assertEquals("1180", numbers.get("n, " + PageFixtures.WAVE));
        assertEquals("news: not a repeat", numbers.get("Repeat"));
        List<String> history = select(d, "//table[@id='history']/tbody/tr[3]/td").stream()
                .map(Element::getTextContent).toList();
        assertEquals(List.of("2026-03-02 09:18 UTC", PageFixtures.ACTOR, "muted until wave 2026-Q2<y> until"
                + " 2026-06-30", "fix-upstream", PageFixtures.NOTE, "console"), history);
    }

    @Test
    void aCompleteEnumerationSaysItIsJudgedBySize() {
        var f = PageFixtures.finding();
        var census = new org.wavewarden.judge.Finding(f.variable(), f.label(), f.kind(), null, null, null, null,
                new org.wavewarden.judge.Finding.Effect("share difference (points)", 2.5, 2.5, 2.5, 2.0),
                f.verdict(), 5000L, 5100L, f.sentence(), null, null, null, null, null);
        var v = PageFixtures.findingView(null);
        var view = new org.wavewarden.store.ConsoleReads.FindingView(v.findingId(), v.runId(), v.dataset(), v.wave(),
                v.againstWave(), census, null, List.of(), List.of());
        Map<String, String> numbers = numbers(parse(Pages.finding(PageFixtures.chrome(Role.VIEWER), view)));
        assertEquals("judged by size: complete enumeration", numbers.get("p"));
        assertEquals("none", numbers.get("Test"));
    }

    private static Map<String, String> numbers(Document d) {
        List<Element> dt = select(d, "//dl[@id='numbers']/dt");
        List<Element> dd = select(d, "//dl[@id='numbers']/dd");
        assertEquals(dt.size(), dd.size());
        Map<String, String> out = new java.util.LinkedHashMap<>();
        for (int i = 0; i < dt.size(); i++) {
            out.put(dt.get(i).getTextContent(), dd.get(i).getTextContent());
        }
        return out;
    }

    @Test
    void theStyleSheetHoldsTheDigestsChartRulesAndVisibleFocus() {
        String css = Pages.css();
        assertTrue(css.contains(HtmlDigest.CSS), "the digest's rules, so a plot looks as in the digest");
        assertTrue(css.indexOf(HtmlDigest.CSS) < css.indexOf(".grid-scroll"), "the console's rules come last");
        assertTrue(css.contains(":focus-visible{outline:3px solid"));
        for (String outside : List.of("url(", "@import", "http:", "https:")) {
            assertFalse(css.contains(outside), "the style sheet refers outside itself: " + outside);
        }
        for (String verdictClass : List.of("c-material", "c-uncertain", "c-minor", "c-stable", "c-cleared",
                "c-quality")) {
            assertTrue(css.contains("." + verdictClass + "{"), verdictClass);
        }
    }

    @Test
    void theProblemPageSaysTheStatusAndTheMessage() {
        Document d = parse(Pages.problem(null, 404, "No finding 999 <here>."));
        assertEquals("404 Not found", select(d, "//h1").get(0).getTextContent());
        assertEquals("No finding 999 <here>.", byId(d, "problem").getTextContent());
        assertTrue(select(d, "//form").isEmpty(), "nobody is logged in, so there is no logout form");
    }

    @Test
    void theSearchListsEachHitWithItsLinks() {
        Document d = parse(PageFixtures.everyPage(Role.VIEWER).get("search"));
        List<String> row = select(d, "//table[@id='search-results']/tbody/tr[1]/*").stream()
                .map(Element::getTextContent).toList();
        assertEquals(List.of(PageFixtures.DATASET, PageFixtures.VARIABLE, PageFixtures.LABEL, PageFixtures.WAVE,
                "▲ MAT MATERIAL", "finding 103"), row);
        assertEquals(List.of("/console/dataset?name=harrowmere%3Cscript%3Ealert%281%29%3C%2Fscript%3E%22%26%27",
                        "/console/wave?dataset=harrowmere%3Cscript%3Ealert%281%29%3C%2Fscript%3E%22%26%27"
                                + "&wave=2025-Q4%27%26", "/console/finding?id=103"),
                select(d, "//table[@id='search-results']//a").stream().map(e -> e.getAttribute("href")).toList());
        Document none = parse(Pages.search(PageFixtures.chrome(Role.VIEWER), "zzz", List.of()));
        assertTrue(byId(none, "search-none").getTextContent().startsWith("No variable"));
        assertTrue(select(none, "//table[@id='search-results']/tbody/tr").isEmpty());
    }

    @Test
    void eachAlertOnTheWavePageSaysItsVerdictSentenceAndLastAction() {
        Document d = parse(Pages.wave(PageFixtures.chrome(Role.VIEWER), PageFixtures.waveView(), null));
        Element muted = select(d, "//section[@id='alerts-muted']//li").get(0);
        assertEquals("■ DQ " + PageFixtures.VARIABLE + " distribution shift no verdict" + PageFixtures.SENTENCE
                + "Last: muted by " + PageFixtures.ACTOR + " at 2026-03-02 09:29 UTC (fix-upstream): "
                + PageFixtures.NOTE, muted.getTextContent());
        Element open = select(d, "//section[@id='alerts-open']//li").get(0);
        assertTrue(open.getTextContent().startsWith("▲ MAT " + PageFixtures.VARIABLE + " distribution shift"
                + " MATERIAL"), open.getTextContent());
    }
}
