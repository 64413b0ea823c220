package org.wavewarden.deliver;

import org.commonmark.node.AbstractVisitor;
import org.commonmark.node.BulletList;
import org.commonmark.node.ListItem;
import org.commonmark.node.Node;
import org.commonmark.node.Paragraph;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.config.Population;
import org.wavewarden.deliver.html.HtmlDigest;
import org.wavewarden.deliver.html.WaveSection;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.AlertView;
import org.wavewarden.review.ReviewAction;
import org.wavewarden.review.ReviewEntry;
import org.wavewarden.review.ReviewReason;
import org.wavewarden.review.SignOff;

import java.time.Instant;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * What a reader of either digest sees of the review of a wave, rendered from records alone: the status line, the
 * explained and muted alerts, the findings still present and cleared, the standing list of variables too few
 * answers can judge, and a complete enumeration's note. Names and notes people typed are data: they stay text.
 */
class DigestReviewSectionsTest {

    static final String DATASET = "harrowmere-household";
    static final Instant AT = Instant.parse("2026-11-30T09:12:00Z");
    static final Instant REPORTED = Instant.parse("2026-11-30T06:15:00Z");

    static AlertView alert(long id, String variable, FindingKind kind, Verdict verdict, AlertState state,
                           ReviewEntry last) {
        return new AlertView(id, 7, DATASET, "2025-Q1", "2024-Q4", variable, kind.name(),
                verdict == null ? null : verdict.name(), "sentence of " + variable, List.of(), REPORTED, state, last);
    }

    static ReviewEntry entry(long alertId, String actor, ReviewAction action, ReviewReason reason, String note,
                             String source, String untilWave, LocalDate untilDate) {
        return new ReviewEntry(alertId * 10, alertId, AT, actor, action, reason, note, source, untilWave, untilDate);
    }

    static SignOff signOff(String actor, String release, boolean forced, String reason) {
        return new SignOff(3, DATASET, "2025-Q1", release, actor, AT, 7, "sha256:ab12", "1.4.0", forced, reason,
                List.of());
    }

    static FindingsReport report(String wave, String against, List<Finding> findings) {
        return new FindingsReport(DATASET, wave, against, REPORTED, 0.05, "BENJAMINI_HOCHBERG", List.of(), findings);
    }

    static Finding shift(String variable, Verdict v, double estimate, double lo, double hi, double threshold) {
        return new Finding(variable, FindingKind.SHIFT, "Welch t", 1.2, 0.2, 0.4,
                new Finding.Effect("difference in means (currency per year)", estimate, lo, hi, threshold), v, 35L,
                37L, "Mean " + variable + " moved.", null);
    }

    static String markdown(List<FindingsReport> reports, DigestRecords records) {
        return MarkdownDigest.render(reports, records);
    }

    static String html(List<FindingsReport> reports, DigestRecords records) {
        return HtmlDigest.render(DATASET, reports.stream().map(r -> new WaveSection(r, List.of())).toList(),
                REPORTED, records);
    }

    /** The text of every paragraph and list item of the Markdown as a reader sees it. */
    static List<String> shownLines(String md) {
        List<String> out = new ArrayList<>();
        HostileLabelsTest.PARSER.parse(md).accept(new AbstractVisitor() {
            @Override
            public void visit(Paragraph p) {
                if (!(p.getParent() instanceof ListItem)) {
                    out.add(HostileLabelsTest.text(p));
                }
            }

            @Override
            public void visit(ListItem item) {
                out.add(HostileLabelsTest.text(item));
            }
        });
        return out;
    }

    /** The items of the Markdown list under the heading that starts with {@code title}. */
    static List<String> listUnder(String md, String title) {
        Node doc = HostileLabelsTest.PARSER.parse(md);
        List<String> items = new ArrayList<>();
        boolean[] under = {false};
        for (Node n = doc.getFirstChild(); n != null; n = n.getNext()) {
            if (n instanceof org.commonmark.node.Heading h) {
                under[0] = HostileLabelsTest.text(h).startsWith(title);
            } else if (under[0] && n instanceof BulletList list) {
                for (Node i = list.getFirstChild(); i != null; i = i.getNext()) {
                    items.add(HostileLabelsTest.text(i));
                }
            }
        }
        return items;
    }

    @ParameterizedTest(name = "{0} open, {1} explained, {2} muted, {3} superseded, signed by ''{4}''")
    @CsvSource(delimiter = '|', nullValues = "-", textBlock = """
            # open | explained | muted | superseded | signed by | release | forced with                    | the status line
            3      | 0         | 0     | 2          | -         | -       | -                              | Alerts: 3 open, 0 explained, 0 muted. Not signed off.
            1      | 2         | 1     | 0          | Ann Reeve | r2      | -                              | Alerts: 1 open, 2 explained, 1 muted. Signed off by Ann Reeve on 2026-11-30 09:12 UTC (release r2).
            1      | 0         | 0     | 1          | Tom Oakes | ''      | mode change briefed to the board | Alerts: 1 open, 0 explained, 0 muted. Signed off by Tom Oakes on 2026-11-30 09:12 UTC (forced: mode change briefed to the board).
            0      | 1         | 0     | 0          | Tom Oakes | r3      | late fieldwork accepted        | Alerts: 0 open, 1 explained, 0 muted. Signed off by Tom Oakes on 2026-11-30 09:12 UTC (release r3; forced: late fieldwork accepted).
            """)
    void theStatusLineCountsTheWavesAlertsByStateLeavesSupersededOnesOutAndNamesTheSignOff(
            int open, int explained, int muted, int superseded, String signedBy, String release, String forcedWith,
            String expected) {
        List<AlertView> alerts = new ArrayList<>();
        long id = 1;
        for (int i = 0; i < open; i++, id++) {
            alerts.add(alert(id, "v" + id, FindingKind.SHIFT, Verdict.MATERIAL, AlertState.OPEN, null));
        }
        for (int i = 0; i < explained; i++, id++) {
            alerts.add(alert(id, "v" + id, FindingKind.SHIFT, Verdict.UNCERTAIN, AlertState.EXPLAINED, null));
        }
        for (int i = 0; i < muted; i++, id++) {
            alerts.add(alert(id, "v" + id, FindingKind.BLANK, null, AlertState.MUTED, null));
        }
        for (int i = 0; i < superseded; i++, id++) {
            alerts.add(alert(id, "v" + id, FindingKind.SHIFT, Verdict.MATERIAL, AlertState.SUPERSEDED, null));
        }
        SignOff so = signedBy == null ? null : signOff(signedBy, release, forcedWith != null, forcedWith);
        WaveStatus status = WaveStatus.of(DATASET, "2025-Q1", alerts, a -> null, so);
        DigestRecords records = new DigestRecords(Map.of(), List.of(status));
        List<FindingsReport> reports = List.of(report("2025-Q1", "2024-Q4", List.of()));

        assertTrue(shownLines(markdown(reports, records)).contains("Review status: " + expected),
                markdown(reports, records));
        assertTrue(html(reports, records).contains("<b>Review status:</b> " + expected + "</p>"));
    }

    @Test
    void aDigestWithoutReviewRecordsHasNoStatusLine() {
        List<FindingsReport> reports = List.of(report("2025-Q1", "2024-Q4", List.of()));
        assertFalse(MarkdownDigest.render(reports).contains("Review status"));
        assertFalse(HtmlDigest.render(DATASET, List.of(new WaveSection(reports.get(0), List.of())), REPORTED)
                .contains("Review status"));
    }

    @Test
    void anExplainedAlertShowsItsReasonCategoryNoteWhoAndWhen() {
        AlertView a = alert(4, "mooring_fee", FindingKind.SHIFT, Verdict.UNCERTAIN, AlertState.EXPLAINED,
                entry(4, "Ruth Penhallow", ReviewAction.EXPLAINED, ReviewReason.PLANNED_CHANGE,
                        "Mode moved to web in 2025-Q1", "command", null, null));
        DigestRecords records = new DigestRecords(Map.of(), List.of(WaveStatus.of(DATASET, "2025-Q1", List.of(a),
                AlertView::last, null)));
        List<FindingsReport> reports = List.of(report("2025-Q1", "2024-Q4", List.of()));
        String expected = "mooring_fee (distribution shift, UNCERTAIN): expected from a design, mode or"
                + " questionnaire change. Note: Mode moved to web in 2025-Q1. By Ruth Penhallow on"
                + " 2026-11-30 09:12 UTC.";

        assertEquals(List.of(expected), listUnder(markdown(reports, records), "Explained (1)"));
        String html = html(reports, records);
        assertTrue(html.contains("<h3>Explained (1)</h3><ul><li>" + expected + "</li></ul>"), html);
    }

    @Test
    void anAlertSomeoneExplainedOrMutedSaysSoInTheAlertTableAndOnItsCard() {
        Finding fee = shift("mooring_fee", Verdict.UNCERTAIN, 25.01, -39.94, 89.96, 40);
        Finding kids = shift("children", Verdict.MATERIAL, 0.6, 0.5, 0.7, 0.2);
        Finding mode = shift("interview_mode", Verdict.MATERIAL, 0.6, 0.5, 0.7, 0.1);
        FindingsReport r = report("2025-Q1", "2024-Q4", List.of(fee, kids, mode));
        WaveStatus status = WaveStatus.of(DATASET, "2025-Q1", List.of(
                alert(1, "mooring_fee", FindingKind.SHIFT, Verdict.UNCERTAIN, AlertState.EXPLAINED, null),
                alert(2, "children", FindingKind.SHIFT, Verdict.MATERIAL, AlertState.MUTED, null),
                alert(3, "interview_mode", FindingKind.SHIFT, Verdict.MATERIAL, AlertState.OPEN, null)),
                a -> null, null);
        DigestRecords records = new DigestRecords(Map.of(), List.of(status));

        String md = markdown(List.of(r), records);
        assertTrue(md.contains("| **UNCERTAIN** (explained) | mooring\\_fee |"), md);
        assertTrue(md.contains("| **MATERIAL** (muted) | children |"), md);
        assertTrue(md.contains("| **MATERIAL** | interview\\_mode |"), md);
        String html = HtmlDigest.render(DATASET, List.of(new WaveSection(r, List.of(
                new org.wavewarden.deliver.html.AlertView(fee, null, null),
                new org.wavewarden.deliver.html.AlertView(kids, null, null),
                new org.wavewarden.deliver.html.AlertView(mode, null, null)))), REPORTED, records);
        assertTrue(html.contains("data-variable=\"mooring_fee\" data-kind=\"SHIFT\" data-verdict=\"UNCERTAIN\""
                + " data-state=\"EXPLAINED\">"), html);
        assertTrue(html.contains("data-variable=\"children\" data-kind=\"SHIFT\" data-verdict=\"MATERIAL\""
                + " data-state=\"MUTED\">"));
        assertTrue(html.contains("data-variable=\"interview_mode\" data-kind=\"SHIFT\" data-verdict=\"MATERIAL\">"));
        assertEquals(2, Pattern.compile("<span class=\"state\">").matcher(html).results().count());
    }

    @Test
    void aMutedAlertIsListedWithItsExpiryRuleReasonAndWho() {
        AlertView a = alert(5, "occupation", FindingKind.BLANK, null, AlertState.MUTED,
                entry(5, "Sam Treloar", ReviewAction.MUTED, ReviewReason.FIX_UPSTREAM, "Register fix due in Q3",
                        "mute rule 4", "2025-Q3", LocalDate.parse("2026-03-31")));
        DigestRecords records = new DigestRecords(Map.of(), List.of(WaveStatus.of(DATASET, "2025-Q1", List.of(a),
                AlertView::last, null)));
        List<FindingsReport> reports = List.of(report("2025-Q1", "2024-Q4", List.of()));
        String expected = "occupation (blank): muted until wave 2025-Q3 or 2026-03-31 (mute rule 4), a data error"
                + " being fixed upstream. Note: Register fix due in Q3. By Sam Treloar on 2026-11-30 09:12 UTC.";

        assertEquals(List.of(expected), listUnder(markdown(reports, records), "Muted: recorded, not delivered (1)"));
        assertTrue(html(reports, records).contains("<h3>Muted: recorded, not delivered (1)</h3><ul><li>" + expected
                + "</li></ul>"));
    }

    @Test
    void notesAndNamesPeopleTypedStayTextInBothDigests() {
        String note = "<script>alert(1)</script> **now** [x](javascript:alert(1))\n# heading\n- item";
        String actor = "Eve | Mallory\n| --- | --- |\n# not a heading";
        AlertView explained = alert(4, "mooring_fee", FindingKind.SHIFT, Verdict.UNCERTAIN, AlertState.EXPLAINED,
                entry(4, actor, ReviewAction.EXPLAINED, ReviewReason.NO_PROBLEM, note, "command", null, null));
        AlertView muted = alert(5, "occupation", FindingKind.BLANK, null, AlertState.MUTED,
                entry(5, actor, ReviewAction.MUTED, null, note, note, note, null));
        WaveStatus status = WaveStatus.of(DATASET, "2025-Q1", List.of(explained, muted), AlertView::last,
                signOff(actor, note, true, note));
        DigestRecords records = new DigestRecords(Map.of(), List.of(status));
        List<FindingsReport> reports = List.of(report("2025-Q1", "2024-Q4", List.of()));

        String md = markdown(reports, records);
        HostileLabelsTest.Census census = new HostileLabelsTest.Census();
        HostileLabelsTest.PARSER.parse(md).accept(census);
        assertEquals(List.of(), census.live, "live markup from a note or a name");
        // Ours: the title, the wave, the two lists, the cautions; no table (the wave has no alert).
        assertEquals(List.of(1, 2, 3, 3, 2), census.headingLevels, md);
        assertEquals(0, census.tables, md);
        // Ours: the quote's lead and the status line's lead, nothing else bold.
        assertEquals(2, census.strong, md);
        assertTrue(shownLines(md).stream().anyMatch(l -> l.startsWith("Review status:")
                && l.contains("Signed off by " + DataText.visible(actor))), md);
        assertTrue(listUnder(md, "Explained").get(0).contains("Note: " + DataText.visible(note)), md);

        String html = html(reports, records);
        String lower = html.toLowerCase(Locale.ROOT);
        assertFalse(lower.contains("<script") || lower.contains("javascript:alert(1)\">")
                || lower.contains("<h1># heading"), html);
        assertTrue(html.contains("Note: &lt;script&gt;alert(1)&lt;/script&gt; **now**"), html);
        assertTrue(html.contains("Signed off by Eve | Mallory"), html);
    }

    @Test
    void aSignedOffWaveWhoseFindingsChangedSaysSoLoudly() {
        Finding changed = Finding.dataQuality("(wave)", FindingKind.SIGNED_WAVE_CHANGED, null, null,
                "2 findings differ from run 7.", null);
        SignOff so = signOff("Ann Reeve", "r2", false, null);
        DigestRecords records = new DigestRecords(Map.of(), List.of(WaveStatus.of(DATASET, "2025-Q1", List.of(),
                a -> null, so)));
        List<FindingsReport> reports = List.of(report("2025-Q1", "2024-Q4", List.of(changed)));
        String expected = "Signed-off wave changed. The findings of this wave changed after it was signed off by"
                + " Ann Reeve on 2026-11-30 09:12 UTC (run 7): the release was signed on other numbers. 2 findings"
                + " differ from run 7.";

        assertTrue(shownLines(markdown(reports, records)).contains(expected), markdown(reports, records));
        assertTrue(html(reports, records).contains("<p class=\"signed-changed\" role=\"alert\"><b>Signed-off wave"
                + " changed.</b> " + expected.substring("Signed-off wave changed. ".length()) + "</p>"));
    }

    /**
     * {@code mooring_fee} has 30-40 answers a wave: its interval is wider than the threshold in every wave, so it
     * is listed once, since the wave that alerted. The interval is R's Welch interval of the two waves' fees:
     * {@code t.test(y, x)} in R 4.2.2 on the seeded samples below gives -39.9368051012 to 89.9630599275, whose
     * half-width {@code qt(0.975, t$parameter) * t$stderr} is 64.94993, shown as 64.9 (3 significant digits).
     */
    @Test
    void aVariableTooFewAnswersCanJudgeIsListedOnceWithItsMinimumDetectableChangeSinceTheWaveThatAlerted() {
        // R 4.2.2: set.seed(15); x <- round(780 + 139*rnorm(35)); y <- round(834 + 150*rnorm(37)); t.test(y, x)
        double low = -39.9368051012;
        double high = 89.9630599275;
        List<String> waves = List.of("2024-Q1", "2024-Q2", "2024-Q3", "2024-Q4", "2025-Q1", "2025-Q2", "2025-Q3");
        List<FindingsReport> reports = new ArrayList<>();
        reports.add(report(waves.get(0), null, List.of()));
        for (int i = 1; i < waves.size(); i++) {
            Finding fee = shift("mooring_fee", Verdict.UNCERTAIN, 25.01, low, high, 40);
            if (i > 1) {
                fee = fee.withRepeat(new Finding.Repeat(Finding.Repeat.Kind.STILL_UNRESOLVABLE, waves.get(i - 1),
                        "2024-Q2"));
            }
            // Unresolvable in the middle waves, then resolved by a larger sample: not standing any more.
            Finding length = i < 6 ? shift("boat_length", Verdict.UNCERTAIN, 0.2, -0.9, 1.3, 0.5)
                    : shift("boat_length", Verdict.STABLE, 0.02, -0.1, 0.14, 0.5);
            // Uncertain but resolvable: a real UNCERTAIN verdict, alerted as usual and not listed.
            Finding berths = shift("berths_let", Verdict.UNCERTAIN, 0.3, 0.1, 0.5, 0.25);
            reports.add(report(waves.get(i), waves.get(i - 1), List.of(fee, length, berths)));
        }
        String expected = "mooring_fee (distribution shift, difference in means (currency per year)): smallest"
                + " detectable change \u00b164.9, threshold \u00b140.0, on 37 answers in wave 2025-Q3; too few"
                + " answers to judge since wave 2024-Q2.";

        String md = markdown(reports, DigestRecords.NONE);
        assertEquals(List.of(expected), listUnder(md, DATASET + ": too few answers to judge"), md);
        assertEquals(1, Pattern.compile(Pattern.quote("too few answers to judge since")).matcher(md).results()
                .count());
        String html = html(reports, DigestRecords.NONE);
        assertTrue(html.contains("<li data-variable=\"mooring_fee\">" + expected + "</li>"), html);
        assertEquals(1, Pattern.compile("<li data-variable=").matcher(html).results().count());
        // The card of the alert says it beside the interval.
        org.wavewarden.judge.Finding news = reports.get(1).findings().get(0);
        String card = HtmlDigest.render(DATASET, List.of(new WaveSection(reports.get(1),
                List.of(new org.wavewarden.deliver.html.AlertView(news, null, null)))), REPORTED);
        assertTrue(card.contains("<span class=\"mde unresolvable\">smallest detectable change &plusmn;64.9: too few"
                + " answers to judge</span>"), card);

        // Findings not marked as repeats (an earlier release's) still give the first wave of the unbroken run.
        List<FindingsReport> unmarked = reports.stream().map(r -> report(r.wave(), r.againstWave(),
                r.findings().stream().map(f -> f.withRepeat(null)).toList())).toList();
        assertEquals(List.of(expected), listUnder(markdown(unmarked, DigestRecords.NONE),
                DATASET + ": too few answers to judge"));
    }

    @Test
    void aVariableThatCouldBeJudgedInBetweenIsListedFromTheWaveItBecameUnresolvableAgain() {
        List<FindingsReport> reports = List.of(
                report("2024-Q2", "2024-Q1", List.of(shift("mooring_fee", Verdict.UNCERTAIN, 0.2, -0.9, 1.3, 0.5))),
                report("2024-Q3", "2024-Q2", List.of(shift("mooring_fee", Verdict.STABLE, 0.0, -0.2, 0.2, 0.5))),
                report("2024-Q4", "2024-Q3", List.of(shift("mooring_fee", Verdict.UNCERTAIN, 0.2, -0.9, 1.3, 0.5))));
        List<String> items = listUnder(markdown(reports, DigestRecords.NONE), DATASET + ": too few answers to judge");
        assertEquals(1, items.size(), items.toString());
        assertTrue(items.get(0).endsWith("in wave 2024-Q4; too few answers to judge since wave 2024-Q4."), items.get(0));
    }

    @Test
    void findingsStillPresentAndProblemsThatClearedAreListedApartFromTheAlerts() {
        Finding blank = Finding.dataQuality("occupation", FindingKind.BLANK, 2000L, 2010L,
                "12.1% of occupation answers are blank.", null)
                .withRepeat(new Finding.Repeat(Finding.Repeat.Kind.STILL_PRESENT, "2024-Q4", "2024-Q2"));
        Finding cleared = new Finding("height_cm", FindingKind.MISSING_RATE_CHANGE, "two-proportion z", -3.1, 0.002,
                0.01, new Finding.Effect("Cohen's h", -0.3, -0.35, -0.25, 0.2), Verdict.CLEARED, 2000L, 2010L,
                "Share of height_cm at the sentinel 999 fell from 2.3% to 0.0%: cleared.", null);
        List<FindingsReport> reports = List.of(report("2025-Q1", "2024-Q4", List.of(blank, cleared)));

        String md = markdown(reports, DigestRecords.NONE);
        assertEquals(List.of("occupation (blank): 12.1% of occupation answers are blank. Still present, first"
                + " alerted in wave 2024-Q2, unchanged from wave 2024-Q4."), listUnder(md, "Still present"));
        assertEquals(List.of("height_cm (missing rate change): Share of height_cm at the sentinel 999 fell from 2.3%"
                + " to 0.0%: cleared."), listUnder(md, "Cleared (1)"));
        String html = html(reports, DigestRecords.NONE);
        assertTrue(html.contains("<div class=\"review-list still-present\"><h3>Still present, not alerted again (1)"));
        assertTrue(html.contains("<div class=\"review-list cleared\"><h3>Cleared (1)</h3>"));
        // CLEARED is counted beside the verdicts only where a finding has it.
        assertTrue(md.contains("Shift verdicts: MATERIAL 0, MINOR 0, UNCERTAIN 0, STABLE 0. Data-quality"), md);
        assertFalse(html.contains("tally v-cleared"), "no CLEARED shift verdict, so no CLEARED tally");
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource(textBlock = """
            CENSUS,   This dataset is a census: every unit of the population is observed
            REGISTER, This dataset is a full register: every unit of the population is observed
            """)
    void aCompleteEnumerationSaysOnceThatItIsJudgedBySizeAloneAndShowsNoFalseDiscoveryRate(Population p,
                                                                                          String opening) {
        DigestRecords records = new DigestRecords(Map.of(DATASET, p), List.of());
        List<FindingsReport> reports = List.of(report("2024", "2023", List.of()), report("2025", "2024", List.of()));

        String md = markdown(reports, records);
        assertEquals(1, Pattern.compile(Pattern.quote(opening)).matcher(md).results().count(), md);
        assertTrue(md.contains("with no p-values, q-values or sampling intervals"));
        assertFalse(md.contains("False discovery rate"), md);
        assertEquals(2, Pattern.compile("Judged by size of change alone\\.").matcher(md).results().count());
        String html = html(reports, records);
        assertEquals(1, Pattern.compile(Pattern.quote(opening)).matcher(html).results().count());
        assertFalse(html.contains("false discovery rate"), html);
        assertEquals(2, Pattern.compile("judged by size of change alone</p>").matcher(html).results().count());

        String sample = markdown(reports, DigestRecords.NONE);
        assertFalse(sample.contains("every unit of the population"));
        assertEquals(2, Pattern.compile("False discovery rate 0.05").matcher(sample).results().count());
    }
}
