package org.wavewarden.console.page;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.w3c.dom.Document;
import org.w3c.dom.Element;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.Role;
import org.wavewarden.store.ConsoleReads;

import java.util.ArrayList;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.wavewarden.console.page.PageFixtures.byId;
import static org.wavewarden.console.page.PageFixtures.parse;
import static org.wavewarden.console.page.PageFixtures.select;

/**
 * The variables-by-waves grid: one cell per variable and wave, a link only where there is a finding, each cell
 * saying its verdict in a symbol and a word (colour only repeats it), and a legend for every symbol.
 */
class GridPageTest {

    private static final List<String> WAVES = List.of("2025-Q1", "2025-Q2", PageFixtures.AGAINST, PageFixtures.WAVE);

    @Test
    void theGridHasOneCellPerVariableAndWaveAndLinksOnlyFindings() {
        ConsoleReads.Grid grid = PageFixtures.grid(5, WAVES);
        Document d = parse(Pages.grid(PageFixtures.chrome(Role.VIEWER), grid, ConsoleReads.GridFilter.ANY));
        assertEquals(5, select(d, "//table[@id='grid']/tbody/tr").size());
        assertEquals(5 * WAVES.size(), select(d, "//table[@id='grid']/tbody/tr/td").size());
        long filled = grid.rows().stream().flatMap(r -> r.cells().stream()).filter(c -> !c.empty()).count();
        assertEquals(filled, select(d, "//table[@id='grid']/tbody/tr/td[a]").size());
        assertTrue(select(d, "//table[@id='grid']//td[@class='empty']//a").isEmpty(), "an empty cell links nowhere");
        assertEquals(5 * WAVES.size() - filled, select(d, "//table[@id='grid']//td[@class='empty']").size());
        List<Element> heads = select(d, "//table[@id='grid']/thead/tr/th[@scope='col']/a");
        assertEquals(WAVES, heads.stream().map(Element::getTextContent).toList());
        assertEquals("/console/wave?dataset=harrowmere%3Cscript%3Ealert%281%29%3C%2Fscript%3E%22%26%27"
                + "&wave=2025-Q3%3Cx%3E", heads.get(2).getAttribute("href"));
        Element firstRow = select(d, "//table[@id='grid']/tbody/tr[1]/th[@scope='row']").get(0);
        assertEquals(PageFixtures.VARIABLE + PageFixtures.LABEL, firstRow.getTextContent());
    }

    /** The first row of {@link PageFixtures#grid}: its cells in order, as a reader and a screen reader get them. */
    @ParameterizedTest(name = "cell {0}: {1}")
    @CsvSource(delimiter = '|', value = {
            "1 | ▲ MAT | c-material a-open      | SHIFT, MATERIAL, alert open",
            "2 | ◆ UNC | c-uncertain           | blank, UNCERTAIN, 2 findings",
            "4 | ● MIN | c-minor a-explained   | blank, MINOR, 4 findings, alert explained",
    })
    void eachCellSaysItsVerdictInASymbolAndAWord(int column, String text, String classes, String said) {
        ConsoleReads.Grid grid = PageFixtures.grid(1, WAVES);
        Document d = parse(Pages.grid(PageFixtures.chrome(Role.VIEWER), grid, ConsoleReads.GridFilter.ANY));
        Element cell = select(d, "//table[@id='grid']/tbody/tr[1]/td[" + column + "]").get(0);
        Element link = select(d, "//table[@id='grid']/tbody/tr[1]/td[" + column + "]/a").get(0);
        assertEquals(classes.strip(), cell.getAttribute("class"));
        assertEquals(text.strip(), link.getTextContent());
        ConsoleReads.GridCell c = grid.rows().get(0).cells().get(column - 1);
        assertEquals("/console/finding?id=" + c.findingId(), link.getAttribute("href"));
        String kind = c.kind().equals("SHIFT") ? "distribution shift" : "blank";
        String expected = PageFixtures.VARIABLE + ", wave " + WAVES.get(column - 1) + ", " + kind + ", "
                + said.strip().substring(said.indexOf(',') + 1).strip();
        assertEquals(expected, link.getAttribute("aria-label"));
    }

    @Test
    void theLegendNamesEverySymbolAndState() {
        Document d = parse(Pages.grid(PageFixtures.chrome(Role.VIEWER), PageFixtures.grid(2, WAVES),
                ConsoleReads.GridFilter.ANY));
        List<String> verdicts = select(d, "//*[@id='legend']//li[@data-verdict]").stream()
                .map(e -> e.getAttribute("data-verdict")).toList();
        assertEquals(List.of("MATERIAL", "MINOR", "UNCERTAIN", "STABLE", "CLEARED", "none"), verdicts);
        for (Element li : select(d, "//*[@id='legend']//li[@data-verdict]")) {
            String cls = select(d, "//*[@id='legend']//li[@data-verdict='" + li.getAttribute("data-verdict")
                    + "']/span").get(0).getAttribute("class");
            assertTrue(cls.startsWith("key c-"), cls);
        }
        assertEquals(AlertState.values().length, select(d, "//*[@id='legend']//li[@data-state]").size());
    }

    @Test
    void theFilterOffersTheDatasetsKindsAndKeepsTheChoice() {
        Document d = parse(Pages.grid(PageFixtures.chrome(Role.VIEWER), PageFixtures.grid(1, WAVES),
                new ConsoleReads.GridFilter("BLANK", "none")));
        Element form = byId(d, "grid-filter");
        assertEquals("get", form.getAttribute("method"));
        assertEquals("/console/dataset", form.getAttribute("action"));
        assertEquals(PageFixtures.DATASET, select(d, "//form[@id='grid-filter']//input[@name='name']").get(0)
                .getAttribute("value"));
        assertEquals(List.of("", "SHIFT", "BLANK", "NOT_A_KIND<z>"), select(d, "//select[@name='kind']/option")
                .stream().map(e -> e.getAttribute("value")).toList());
        assertEquals(List.of("BLANK"), select(d, "//select[@name='kind']/option[@selected]").stream()
                .map(e -> e.getAttribute("value")).toList());
        assertEquals(List.of("none"), select(d, "//select[@name='verdict']/option[@selected]").stream()
                .map(e -> e.getAttribute("value")).toList());
    }

    @Test
    void aGridOfThreeHundredVariablesByFortyWavesRendersEveryCell() {
        List<String> waves = new ArrayList<>();
        for (int i = 0; i < 40; i++) {
            waves.add("20" + (10 + i / 4) + "-Q" + (1 + i % 4));
        }
        String html = Pages.grid(PageFixtures.chrome(Role.VIEWER), PageFixtures.grid(300, waves),
                ConsoleReads.GridFilter.ANY);
        Document d = parse(html);
        assertEquals(300 * 40, select(d, "//table[@id='grid']/tbody/tr/td").size());
    }

    @Test
    void aFilterThatMatchesNothingSaysSo() {
        ConsoleReads.Grid empty = new ConsoleReads.Grid("harrowmere-household", WAVES, List.of(), List.of("SHIFT"));
        Document d = parse(Pages.grid(PageFixtures.chrome(Role.VIEWER), empty,
                new ConsoleReads.GridFilter("SHIFT", "MATERIAL")));
        assertTrue(byId(d, "grid-empty").getTextContent().startsWith("No finding"));
        assertTrue(select(d, "//table[@id='grid']/tbody/tr").isEmpty());
    }
}
