package org.wavewarden.demo;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.DynamicTest;
import org.junit.jupiter.api.TestFactory;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.codebook.CodeLabels;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.deliver.Json;
import org.wavewarden.judge.Against;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Every number a reader sees in a finding's sentence is a number of the finding as {@code findings.json} holds it,
 * to the precision printed: the demo is run end to end on embedded PostgreSQL (both datasets, every wave), and
 * each sentence's numbers are read back and looked up in its finding.
 *
 * <p>Most numbers are looked up among the finding's numeric fields (as they are, or times 100 for shares and
 * points). A few are checked by the rule that wrote them: "p = 0.14" against the p-value, "about 1 in 7" against
 * 1 / p, "over the 40 tests of this run" against the family the q-values were adjusted over, "95% CI" against the
 * run's alpha, "12 of 480 rows (2.5%)" by dividing the two counts, "6.6 times as many" by dividing the two shares,
 * the missing-rate note by the rows of the variable's MISSING_RATE_CHANGE finding, and an ISO date (a date
 * comparison's medians, spans and the medians' interval limits) against the dates of the finding's detail. Text the detector wrote
 * (a candidate's {@code evidence}) is held in the JSON as it is printed and is not read again.
 */
class SentenceNumbersTest {

    @TempDir
    static Path out;
    static DemoRun.Outcome outcome;

    @BeforeAll
    static void runTheDemo() {
        outcome = DemoRun.run(out, new PrintWriter(new StringWriter(), true));
    }

    @TestFactory
    Stream<DynamicTest> everyNumberInEverySentenceIsANumberOfItsFinding() {
        List<DynamicTest> tests = new ArrayList<>();
        List<FindingsReport> all = new ArrayList<>(outcome.reports());
        all.addAll(outcome.panelReports());
        for (FindingsReport r : all) {
            tests.add(DynamicTest.dynamicTest(r.dataset() + " " + r.wave(), () -> {
                List<String> problems = new ArrayList<>();
                for (Finding f : r.findings()) {
                    problems.addAll(check(r, f));
                }
                assertTrue(problems.isEmpty(), String.join("\n", problems));
            }));
        }
        return tests.stream();
    }

    @org.junit.jupiter.params.ParameterizedTest
    @org.junit.jupiter.params.provider.CsvSource(value = {"40, true", "39, false", "NULL, false"}, nullValues = "NULL")
    void thePrintedFamilySizeIsTheFindingsOwnFamilySize(Integer field, boolean agrees) {
        Finding f = new Finding("x", FindingKind.SHIFT, "t", null, 0.01, 0.03, null, null, null, null,
                "Seen over the 40 tests of this run.", null, null, null, field, "BENJAMINI_HOCHBERG");
        FindingsReport r = new FindingsReport("d", "w2", "w1", java.time.Instant.EPOCH, 0.05, "BENJAMINI_HOCHBERG",
                List.of(), List.of(f));
        List<String> problems = check(r, f);
        assertTrue(agrees == problems.stream().noneMatch(x -> x.contains("family of 40")), String.join("\n", problems));
    }

    @org.junit.jupiter.params.ParameterizedTest
    @org.junit.jupiter.params.provider.CsvSource(value = {"20.0, true", "30.0, false"})
    void numbersInsideValueAndVariableLabelsAreTextNotNumbersOfTheFinding(String printed, boolean agrees) {
        java.util.Map<String, Object> row = new java.util.LinkedHashMap<>();
        row.put("category", "7");
        row.put("label", "Aged 65 or more, 2 adults");
        row.put("shareBaseline", 0.1);
        row.put("shareCurrent", 0.2);
        Finding f = new Finding("hh_type", "Household type in 2025 (12 groups)", FindingKind.CODE_APPEARED, null,
                null, null, null, null, null, null, null, "In hh_type (Household type in 2025 (12 groups)) the share"
                + " answering 'Aged 65 or more, 2 adults' (7) rose from 10.0% to " + printed + "%.",
                java.util.Map.of("categories", List.of(row)), null, null, null, null);
        FindingsReport r = new FindingsReport("d", "w2", "w1", java.time.Instant.EPOCH, 0.05, "BENJAMINI_HOCHBERG",
                List.of(), List.of(f));
        List<String> problems = check(r, f);
        assertTrue(agrees == problems.isEmpty(), String.join("\n", problems));
    }

    @org.junit.jupiter.api.Test
    void everyShiftOfAVariableWhoseMissingRateChangedMateriallySaysHowManyRowsItRestsOn() {
        List<String> problems = new ArrayList<>();
        int seen = 0;
        List<FindingsReport> all = new ArrayList<>(outcome.reports());
        all.addAll(outcome.panelReports());
        for (FindingsReport r : all) {
            for (Finding rate : r.findings()) {
                if (rate.kind() != FindingKind.MISSING_RATE_CHANGE
                        || rate.verdict() != org.wavewarden.judge.Verdict.MATERIAL) {
                    continue;
                }
                for (Finding f : r.findings()) {
                    if (f.kind() == FindingKind.SHIFT && f.variable().equals(rate.variable())
                            && java.util.Objects.equals(f.against(), rate.against())) {
                        seen++;
                        if (!MISSING_NOTE.matcher(f.sentence()).find()) {
                            problems.add(r.wave() + " " + f.variable() + ": " + f.sentence());
                        }
                    }
                }
            }
        }
        assertTrue(seen > 0, "the demo has no shift beside a MATERIAL missing-rate change");
        assertTrue(problems.isEmpty(), String.join("\n", problems));
    }

    static final Pattern NUMBER = Pattern.compile("(?<![\\w.])[+-]?\\d[\\d,]*(?:\\.\\d+)?");
    static final Pattern P_VALUE = Pattern.compile("p (<|=) ([0-9.]+)");
    static final Pattern Q_VALUE = Pattern.compile("q (<|=) ([0-9.]+)");
    static final Pattern ONE_IN = Pattern.compile("(about|fewer than) 1 in ([\\d,]+) comparisons");
    static final Pattern FAMILY = Pattern.compile("over the ([\\d,]+) tests of this run");
    static final Pattern CONFIDENCE = Pattern.compile("(\\d+)% (?:CI|interval)");
    static final Pattern BREAKDOWN_Q = Pattern.compile("across [a-z ]+ \\(q (<|=) ([0-9.]+)\\)");
    static final Pattern ONLY_IN = Pattern.compile("All ([\\d,]+) [^.]*? in this wave are in [a-z ]+ (\\S+)"
            + " \\(([0-9.]+)% of its rows");
    static final Pattern DESIGN_EFFECT = Pattern.compile("about ([0-9.]+) times that of a simple random sample"
            + " \\(1 \\+ \\(m0 - 1\\) rho, Kish 1962\\)");
    static final Pattern OF_ROWS = Pattern.compile("([\\d,]+) of ([\\d,]+) rows \\(([0-9.]+)%\\)");
    static final Pattern RATIO = Pattern.compile("from ([0-9.]+)% to ([0-9.]+)% of rows, ([0-9.]+) times as many");
    static final Pattern MISSING_NOTE = Pattern.compile("; note that ([\\d,]+) of ([\\d,]+) rows \\(([0-9.]+)%\\)"
            + " have no valid answer this wave against ([\\d,]+) of ([\\d,]+) \\(([0-9.]+)%\\) before, so the shift"
            + " rests on the ([\\d,]+) rows \\(([0-9.]+)%\\) that answered");
    /** An ISO date, which a date finding's detail holds as text. */
    static final Pattern DATE = Pattern.compile("\\b\\d{4}-\\d{2}-\\d{2}\\b");
    /** Fields holding labels: the finding's variable label and the value labels beside codes in its detail. */
    static final java.util.Set<String> LABEL_KEYS = java.util.Set.of("label", "labels", "baselineLabel");
    /** The code in brackets after a value label whose text was taken out: "'' (7)" or "'' (7: 41)". */
    static final Pattern CODE_AFTER_LABEL = Pattern.compile("'' \\([^):]*(?=[):])");
    /** The sources of magnitude words, named beside them. */
    static final Pattern CITATION = Pattern.compile("(Cohen|Romano et al\\.) \\d{4}");

    static List<String> check(FindingsReport r, Finding f) {
        List<String> problems = new ArrayList<>();
        String where = r.dataset() + " " + r.wave() + " " + f.variable() + " " + f.kind() + ": ";
        JsonNode json = Json.mapper().valueToTree(f);
        List<Double> numbers = new ArrayList<>();
        List<String> verbatim = new ArrayList<>();
        collect(json, null, numbers, verbatim);
        numbers.add(r.alpha());
        String s = f.sentence();
        for (String v : verbatim) {
            s = s.replace(v.strip().replaceAll("[.]+$", ""), " ");
        }
        // Labels are data, not numbers of the finding: a quoted value label and the code in brackets after it, and
        // the variable label in brackets after the name, as codebook.CodeLabels shows them.
        List<String> labels = new ArrayList<>();
        labelTexts(json, null, labels);
        labels.sort(java.util.Comparator.comparingInt(String::length).reversed());
        for (String l : labels) {
            String shown = CodeLabels.shown(l);
            s = s.replace("'" + shown + "'", "''").replace("(" + shown + ")", "()");
        }
        s = CODE_AFTER_LABEL.matcher(s).replaceAll("'' (");
        // A finding judged against a further baseline opens with that baseline's name ("Against 2024-Q2, 4 waves
        // back:"), text the finding holds in its against field, its "N waves back" being part of the name.
        if (f.against() != null) {
            String phrase = Against.phrase(f.against());
            s = s.replace(Character.toUpperCase(phrase.charAt(0)) + phrase.substring(1), " ").replace(phrase, " ");
        }
        // An interviewer flag's offending values are answers as the data hold them, text and not numbers.
        for (JsonNode v : json.path("detail").path("offendingValues")) {
            s = s.replace(v.asText(), " ");
        }
        s = s.replace(f.variable(), " ");
        s = s.replaceAll("'[^']*'", " ");
        s = CITATION.matcher(s).replaceAll(" ");
        // a repeat's note names the waves it repeats, which its repeat field holds
        for (String w : Stream.of(r.wave(), r.againstWave(), Against.wavesOf(f.against()), f.repeat() == null ? null : f.repeat().firstWave(),
                f.repeat() == null ? null : f.repeat().previousWave()).filter(java.util.Objects::nonNull).toList()) {
            s = s.replace("wave " + w, " ");
        }

        Matcher m = DATE.matcher(s);
        while (m.find()) {
            if (!texts(json.path("detail")).contains(m.group())) {
                problems.add(where + "the date " + m.group() + " is not a date of the finding (" + f.sentence() + ")");
            }
        }
        s = DATE.matcher(s).replaceAll(" ");
        m = MISSING_NOTE.matcher(s);
        if (m.find()) {
            Optional<Finding> rate = r.findings().stream().filter(x -> x.variable().equals(f.variable())
                    && x.kind() == FindingKind.MISSING_RATE_CHANGE
                    && java.util.Objects.equals(x.against(), f.against())).findFirst();
            if (rate.isEmpty()) {
                problems.add(where + "a missing-rate note without a MISSING_RATE_CHANGE finding");
            } else {
                long rowsC = rate.get().nCurrent();
                long rowsB = rate.get().nBaseline();
                expect(problems, where, "rows this wave", rowsC, count(m.group(2)));
                expect(problems, where, "rows before", rowsB, count(m.group(5)));
                expect(problems, where, "missing this wave", rowsC - f.nCurrent(), count(m.group(1)));
                expect(problems, where, "missing before", rowsB - f.nBaseline(), count(m.group(4)));
                expect(problems, where, "answered", f.nCurrent(), count(m.group(7)));
                percent(problems, where, count(m.group(1)), count(m.group(2)), m.group(3));
                percent(problems, where, count(m.group(4)), count(m.group(5)), m.group(6));
                percent(problems, where, count(m.group(7)), count(m.group(2)), m.group(8));
            }
            s = s.substring(0, m.start()) + s.substring(m.end());
        }
        // Where it changed (judge.WhereItChanged): "the change differs across districts (q < 0.001)" is the q of
        // one of the finding's breakdowns, not the finding's own.
        m = BREAKDOWN_Q.matcher(s);
        while (m.find()) {
            boolean ok = false;
            for (JsonNode b : json.path("breakdowns")) {
                double q = b.path("qValue").asDouble(Double.NaN);
                ok |= m.group(1).equals("<") ? q < Double.parseDouble(m.group(2)) : matches(q, m.group(2), 1);
            }
            if (!ok) {
                problems.add(where + "'" + m.group() + "' is the q of none of the finding's breakdowns");
            }
        }
        s = BREAKDOWN_Q.matcher(s).replaceAll(" ");
        // "All 105 rows missing in this wave are in interviewer id H17 (45.5% of its rows; ...": the count is the
        // domain's share of its rows in this wave times those rows, as the sentence's rule wrote it.
        m = ONLY_IN.matcher(s);
        while (m.find()) {
            boolean ok = false;
            for (JsonNode b : json.path("breakdowns")) {
                for (JsonNode d : b.path("domains")) {
                    double after = d.path("after").asDouble();
                    ok |= d.path("domain").asText().equals(m.group(2))
                            && Math.round(after * d.path("nCurrent").asLong()) == count(m.group(1))
                            && matches(after, m.group(3), 100);
                }
            }
            if (!ok) {
                problems.add(where + "'" + m.group() + "' is no domain of the finding's breakdowns");
            }
        }
        s = ONLY_IN.matcher(s).replaceAll(" ");
        // An interviewer effect's design effect, 1 + (m0 - 1) rho (Kish 1962), from the two numbers it holds.
        m = DESIGN_EFFECT.matcher(s);
        while (m.find()) {
            JsonNode detail = json.path("detail");
            double deff = 1 + (detail.path("m0").asDouble(Double.NaN) - 1) * detail.path("icc").asDouble(Double.NaN);
            if (!matches(deff, m.group(1), 1)) {
                problems.add(where + "'" + m.group() + "' but 1 + (m0 - 1) rho is " + deff);
            }
        }
        s = DESIGN_EFFECT.matcher(s).replaceAll(" ");
        m = P_VALUE.matcher(s);
        while (m.find()) {
            boolean ok = m.group(1).equals("<") ? f.pValue() < Double.parseDouble(m.group(2))
                    : matches(f.pValue(), m.group(2), 1);
            if (!ok) {
                problems.add(where + "p " + m.group(1) + " " + m.group(2) + " but the finding's p is " + f.pValue());
            }
        }
        s = P_VALUE.matcher(s).replaceAll(" ");
        m = Q_VALUE.matcher(s);
        // An interviewer flag holds its q in its detail, a finding of the run's family on the finding itself.
        double ownQ = f.qValue() != null ? f.qValue() : json.path("detail").path("qValue").asDouble(Double.NaN);
        while (m.find()) {
            boolean ok = m.group(1).equals("<") ? ownQ < Double.parseDouble(m.group(2))
                    : matches(ownQ, m.group(2), 1);
            if (!ok) {
                problems.add(where + "q " + m.group(1) + " " + m.group(2) + " but the finding's q is " + ownQ);
            }
        }
        s = Q_VALUE.matcher(s).replaceAll(" ");
        m = ONE_IN.matcher(s);
        while (m.find()) {
            long n = count(m.group(2));
            boolean ok = m.group(1).equals("fewer than") ? f.pValue() < 1.0 / n
                    : n == Math.max(2, Math.round(1 / f.pValue()));
            if (!ok) {
                problems.add(where + "'" + m.group() + "' does not follow from p = " + f.pValue());
            }
        }
        s = ONE_IN.matcher(s).replaceAll(" ");
        m = FAMILY.matcher(s);
        while (m.find()) {
            long family = count(m.group(1));
            if (f.fdrFamilySize() == null || f.fdrFamilySize() != family) {
                problems.add(where + "family of " + family + " tests, but the finding's fdrFamilySize is "
                        + f.fdrFamilySize());
            }
        }
        s = FAMILY.matcher(s).replaceAll(" ");
        m = CONFIDENCE.matcher(s);
        while (m.find()) {
            expect(problems, where, "confidence level", Math.round(100 * (1 - r.alpha())), count(m.group(1)));
        }
        s = CONFIDENCE.matcher(s).replaceAll(" CI");
        m = OF_ROWS.matcher(s);
        StringBuilder rest = new StringBuilder();
        while (m.find()) {
            percent(problems, where, count(m.group(1)), count(m.group(2)), m.group(3));
            m.appendReplacement(rest, m.group(1) + " of " + m.group(2) + " rows");
        }
        m.appendTail(rest);
        s = rest.toString();
        m = RATIO.matcher(s);
        if (m.find()) {
            String ratio = m.group(3);
            boolean ok = false;
            for (double b : numbers) {
                for (double a : numbers) {
                    ok |= b > 0 && matches(100 * b, m.group(1), 1) && matches(100 * a, m.group(2), 1)
                            && String.format(Locale.ROOT, "%.2g", a / b).equals(ratio);
                }
            }
            if (!ok) {
                problems.add(where + "'" + m.group() + "': no two shares of the finding give that ratio");
            }
            s = s.replace(ratio + " times as many", " times as many");
        }

        m = NUMBER.matcher(s);
        while (m.find()) {
            String printed = m.group();
            boolean ok = false;
            for (double v : numbers) {
                ok |= matches(v, printed, 1) || matches(v, printed, 100);
            }
            if (!ok) {
                problems.add(where + printed + " is not a number of the finding (" + f.sentence() + ")");
            }
        }
        return problems;
    }

    /** Every finite number of the finding, and the text fields printed as they are (the detector's evidence). */
    static void collect(JsonNode node, String key, List<Double> numbers, List<String> verbatim) {
        if (node.isNumber() && Double.isFinite(node.asDouble())) {
            numbers.add(node.asDouble());
        } else if (node.isTextual() && "evidence".equals(key)) {
            verbatim.add(node.asText());
        } else if (node.isObject()) {
            node.fields().forEachRemaining(e -> collect(e.getValue(), e.getKey(), numbers, verbatim));
        } else if (node.isArray()) {
            node.forEach(n -> collect(n, key, numbers, verbatim));
        }
    }

    /** The labels a finding holds: its variable label, and every value label of its detail. */
    static void labelTexts(JsonNode node, String key, List<String> out) {
        if (node.isTextual() && LABEL_KEYS.contains(key)) {
            out.add(node.asText());
        } else if (node.isObject()) {
            node.fields().forEachRemaining(e -> labelTexts(e.getValue(), e.getKey(), out));
        } else if (node.isArray()) {
            node.forEach(n -> labelTexts(n, key, out));
        }
    }

    /** Every text value in a finding's detail, and each day number in it as the ISO date it falls on. */
    static List<String> texts(JsonNode node) {
        List<String> out = new ArrayList<>();
        if (node.isTextual()) {
            out.add(node.asText());
        } else if (node.isContainerNode()) {
            node.forEach(n -> out.addAll(texts(n)));
        }
        if (node.isObject()) {
            for (String interval : List.of("medianBaselineInterval", "medianCurrentInterval")) {
                for (String limit : List.of("ciLow", "ciHigh")) {
                    JsonNode day = node.path(interval).path(limit);
                    if (day.isNumber()) {
                        out.add(java.time.LocalDate.ofEpochDay((long) Math.floor(day.asDouble())).toString());
                    }
                }
            }
        }
        return out;
    }

    /** Whether {@code value * scale} prints as {@code printed} at the printed number of decimals. */
    static boolean matches(double value, String printed, double scale) {
        String plain = printed.replace(",", "");
        double x = Double.parseDouble(plain);
        int dot = plain.indexOf('.');
        int decimals = dot < 0 ? 0 : plain.length() - dot - 1;
        double half = 0.5 * Math.pow(10, -decimals);
        double v = value * scale;
        return Math.abs(v - x) <= half * (1 + 1e-9) + 1e-12 * Math.abs(v);
    }

    static void percent(List<String> problems, String where, long count, long of, String printed) {
        if (of <= 0 || !matches(100.0 * count / of, printed, 1)) {
            problems.add(where + count + " of " + of + " is not " + printed + "%");
        }
    }

    static void expect(List<String> problems, String where, String what, long expected, long printed) {
        if (expected != printed) {
            problems.add(where + what + ": printed " + printed + ", the findings say " + expected);
        }
    }

    static long count(String printed) {
        return Long.parseLong(printed.replace(",", ""));
    }
}
