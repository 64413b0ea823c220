package org.wavewarden.cli;

import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.MethodOrderer;
import org.junit.jupiter.api.Order;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestInstance;
import org.junit.jupiter.api.TestMethodOrder;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * From alert to sign-off with the real commands on a real PostgreSQL server, as a survey team goes: the third wave
 * of the small survey has a MATERIAL shift of {@code score} and a changed shape of {@code spread}; the spread change
 * was declared ahead in the configuration, so it is explained when raised. Signing the wave off is refused while the
 * score alert is open, forced with a reason, and signed plainly once the alert is explained. The steps build on each
 * other, in order.
 */
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
@TestMethodOrder(MethodOrderer.OrderAnnotation.class)
class AlertsAndSignOffCommandTest {

    static final String OFFICE = "Harrowmere County Survey Office";

    @TempDir
    static Path dir;
    String config;
    long scoreAlert;
    long spreadAlert;

    @BeforeAll
    void judgeThreeWaves() throws Exception {
        String url = TestDatabase.freshDatabase("alerts_cli");
        SmallSurvey.createTable(url);
        Path[] csv = SmallSurvey.writeWaves(dir);
        String yaml = SmallSurvey.config(url, null).replace("    exclude: [respondent_id]\n", """
                    exclude: [respondent_id]
                    expectedChanges:
                      - variable: spread
                        waves: w3
                        reason: planned-change
                        note: the spread item moved to a 0-100 slider in w3
                        by: %s
                """.formatted(OFFICE));
        Path file = dir.resolve("c.yaml");
        Files.writeString(file, yaml);
        config = file.toString();
        for (int w = 1; w <= 3; w++) {
            CliRun imported = CliRun.of("import", "--config", config, "--wave", "w" + w, csv[w - 1].toString());
            assertEquals(0, imported.exitCode(), imported.err());
        }
        for (String w : List.of("w2", "w3")) {
            CliRun checked = CliRun.of("check", "--config", config, "--wave", w, "--out", dir.resolve(w).toString());
            assertEquals(0, checked.exitCode(), checked.err());
        }
    }

    CliRun run(String... args) {
        String[] all = new String[args.length + 2];
        all[0] = args[0];
        all[1] = "--config";
        all[2] = config;
        System.arraycopy(args, 1, all, 3, args.length - 1);
        return CliRun.of(all);
    }

    /** Runs a subcommand: {@code alerts list ...} gets its --config after {@code list}. */
    CliRun alerts(String sub, String... args) {
        String[] all = new String[args.length + 4];
        all[0] = "alerts";
        all[1] = sub;
        all[2] = "--config";
        all[3] = config;
        System.arraycopy(args, 0, all, 4, args.length);
        return CliRun.of(all);
    }

    /** The ids in the first column of a listing's rows, in its order (not the closing count, "2 alert(s)"). */
    static List<Long> rowIds(String listing) {
        return listing.lines().map(String::strip).filter(l -> l.matches("\\d+\\s.*") && !l.endsWith(" alert(s)"))
                .map(l -> Long.parseLong(l.split("\\s+")[0])).toList();
    }

    /** The id in the first column of the listed row whose cells include all of {@code cells}. */
    static long idOf(String listing, String... cells) {
        for (String line : listing.lines().toList()) {
            List<String> parts = List.of(line.strip().split("\\s+"));
            if (!parts.isEmpty() && parts.get(0).matches("\\d+") && parts.containsAll(List.of(cells))) {
                return Long.parseLong(parts.get(0));
            }
        }
        throw new AssertionError("no row with " + List.of(cells) + " in:\n" + listing);
    }

    @Test
    @Order(1)
    void theListShowsEachAlertWithItsStateAndTheExpectedChangeExplainedAtCreation() {
        CliRun all = alerts("list", "--dataset", "small-survey", "--wave", "w3");
        assertEquals(0, all.exitCode(), all.err());
        assertTrue(all.out().lines().findFirst().orElse("").matches(
                "\\s+id\\s+dataset\\s+wave\\s+variable\\s+kind\\s+verdict\\s+state\\s+last action"), all.out());
        scoreAlert = idOf(all.out(), "small-survey", "w3", "score", "SHIFT", "MATERIAL", "open");
        spreadAlert = idOf(all.out(), "small-survey", "w3", "spread");

        CliRun explained = alerts("list", "--wave", "w3", "--state", "explained");
        assertEquals(0, explained.exitCode(), explained.err());
        assertEquals(spreadAlert, idOf(explained.out(), "w3", "spread", "explained"));
        assertTrue(explained.out().contains("explained by " + OFFICE), explained.out());
        assertTrue(!explained.out().contains(" score "), "the score alert is open:\n" + explained.out());
    }

    @Test
    @Order(2)
    void filtersByVerdictAndKindNarrowTheList() {
        // w3 has two alerts: the score's shift and the spread's change of shape. Each filter takes one away.
        assertEquals(List.of(scoreAlert, spreadAlert), rowIds(alerts("list", "--wave", "w3").out()));
        CliRun material = alerts("list", "--wave", "w3", "--verdict", "material", "--kind", "shift");
        assertEquals(0, material.exitCode(), material.err());
        assertEquals(List.of(scoreAlert), rowIds(material.out()), material.out());
        assertEquals(List.of(spreadAlert), rowIds(alerts("list", "--wave", "w3", "--kind", "SHAPE_CHANGE").out()));
        assertEquals(List.of(), rowIds(alerts("list", "--wave", "w3", "--verdict", "STABLE").out()));
        assertEquals("0 alert(s)", alerts("list", "--wave", "no-such-wave").out().strip().lines()
                .reduce((a, b) -> b).orElse(""));
    }

    @Test
    @Order(3)
    void badValuesOnTheCommandLineAreRefusedWithTheChoices() {
        CliRun state = alerts("list", "--state", "closed");
        assertEquals(2, state.exitCode());
        assertTrue(state.err().contains("expected one of open, explained, muted, superseded but got 'closed'"),
                state.err());
        CliRun reason = alerts("explain", String.valueOf(scoreAlert), "--reason", "mode", "--as", "T. Quill");
        assertEquals(2, reason.exitCode());
        assertTrue(reason.err().contains("expected one of planned-change, fix-upstream, real-change, no-problem but"
                + " got 'mode'"), reason.err());
        CliRun forever = alerts("mute", String.valueOf(scoreAlert), "--as", "T. Quill");
        assertEquals(2, forever.exitCode());
        assertTrue(forever.err().contains("give --until-wave WAVE, --until-date DATE or both"), forever.err());
        CliRun past = alerts("mute", String.valueOf(scoreAlert), "--until-date", "2001-01-31", "--as", "T. Quill");
        assertEquals(2, past.exitCode());
        assertTrue(past.err().contains("--until-date 2001-01-31 is past"), past.err());
        CliRun badDate = alerts("mute", String.valueOf(scoreAlert), "--until-date", "31.01.2099", "--as", "T. Quill");
        assertEquals(2, badDate.exitCode());
        assertTrue(badDate.err().contains("--until-date"), badDate.err());
        CliRun unknown = alerts("history", "987654");
        assertEquals(2, unknown.exitCode());
        assertTrue(unknown.err().contains("there is no alert 987654"), unknown.err());
        CliRun blank = alerts("explain", String.valueOf(scoreAlert), "--reason", "no-problem", "--as", " ");
        assertEquals(2, blank.exitCode());
        assertTrue(blank.err().contains("the acting person from --as is blank"), blank.err());
    }

    @Test
    @Order(4)
    void signingOffIsRefusedWhileTheMaterialAlertIsOpenNamingItAndTheWayOut() {
        CliRun refused = run("signoff", "w3", "--as", "R. Ashdown");
        assertEquals(2, refused.exitCode(), refused.out() + refused.err());
        assertTrue(refused.err().startsWith("refused: "), refused.err());
        assertEquals(scoreAlert, idOf(refused.err(), "score", "SHIFT", "MATERIAL"));
        assertTrue(refused.err().contains("alerts explain ID --reason KEY") && refused.err().contains("--force"),
                refused.err());
        CliRun noReason = run("signoff", "w3", "--force", "--as", "R. Ashdown");
        assertEquals(2, noReason.exitCode());
        assertTrue(noReason.err().contains("--force needs --reason TEXT"), noReason.err());
        CliRun nothing = run("signoff", "--show", "w3");
        assertEquals(2, nothing.exitCode());
        assertTrue(nothing.err().contains("wave w3 of small-survey is not signed off"), nothing.err());
    }

    @Test
    @Order(5)
    void aForcedSignOffRecordsItsReasonAndTheAlertsAsTheyStood() {
        CliRun forced = run("signoff", "w3", "--force", "--reason", "board meeting; score reviewed by phone",
                "--as", "R. Ashdown");
        assertEquals(0, forced.exitCode(), forced.err());
        CliRun shown = run("signoff", "--show", "w3");
        assertEquals(0, shown.exitCode(), shown.err());
        assertTrue(shown.out().startsWith("small-survey wave w3 signed off by R. Ashdown at "), shown.out());
        assertTrue(shown.out().contains("forced although a MATERIAL alert was open: board meeting; score reviewed"
                + " by phone"), shown.out());
        assertTrue(Pattern.compile("run \\d+, configuration [0-9a-f]{64}, ").matcher(shown.out()).find(),
                shown.out());
        assertEquals(scoreAlert, idOf(shown.out(), "score", "SHIFT", "MATERIAL", "open"));
        idOf(shown.out(), "spread", "explained");
    }

    @Test
    @Order(6)
    void muteAndUnmuteMoveTheStateAndAreKeptInTheHistory() {
        CliRun muted = alerts("mute", String.valueOf(scoreAlert), "--until-date", "2099-12-31", "--reason",
                "fix-upstream", "--note", "the field agency reloads score", "--as", "T. Quill");
        assertEquals(0, muted.exitCode(), muted.err());
        idOf(alerts("list", "--state", "muted").out(), "score", "muted");
        CliRun unmuted = alerts("unmute", String.valueOf(scoreAlert), "--note", "reload done", "--as", "T. Quill");
        assertEquals(0, unmuted.exitCode(), unmuted.err());
        idOf(alerts("list", "--state", "open", "--wave", "w3").out(), "score", "open");
    }

    @Test
    @Order(7)
    void anExplanationLiftsTheBlockAndTheHistoryTellsTheWholeStory() {
        CliRun explained = alerts("explain", String.valueOf(scoreAlert), "--reason", "real-change", "--note",
                "scores rose with the new bus line", "--as", "T. Quill");
        assertEquals(0, explained.exitCode(), explained.err());
        assertTrue(explained.out().contains("score SHIFT MATERIAL, explained"), explained.out());

        CliRun history = alerts("history", String.valueOf(scoreAlert));
        assertEquals(0, history.exitCode(), history.err());
        List<String> actions = history.out().lines().skip(2).map(l -> {
            Matcher m = Pattern.compile("^\\s+\\d{4}-\\d\\d-\\d\\d \\d\\d:\\d\\d UTC  (\\w+) by (.+?)(?:, | \\()")
                    .matcher(l);
            return m.find() ? m.group(1) + " by " + m.group(2) : l;
        }).toList();
        assertEquals(List.of("opened by wavewarden", "muted by T. Quill", "unmuted by T. Quill",
                "explained by T. Quill"), actions, history.out());
        assertTrue(history.out().contains("fix-upstream, until 2099-12-31 (command): the field agency reloads score"),
                history.out());
        assertTrue(history.out().contains("real-change (command): scores rose with the new bus line"),
                history.out());

        CliRun signed = run("signoff", "w3", "--as", "R. Ashdown");
        assertEquals(0, signed.exitCode(), signed.err());
        assertTrue(!signed.out().contains("forced"), signed.out());
        CliRun all = run("signoff", "--show");
        assertEquals(0, all.exitCode(), all.err());
        assertTrue(all.out().contains("2 sign-off(s) of small-survey"), all.out());
        assertTrue(all.out().contains("forced: board meeting"), all.out());
    }

    @Test
    @Order(8)
    void anExplanationThatNoLongerHoldsIsReopenedWithItsReasonAndOnlyAnExplainedAlertCanBe() {
        CliRun reopened = alerts("reopen", String.valueOf(scoreAlert), "--note", "the bus line opened a year later",
                "--as", "T. Quill");
        assertEquals(0, reopened.exitCode(), reopened.err());
        assertEquals(scoreAlert, idOf(alerts("list", "--state", "open", "--wave", "w3").out(), "score", "open"));

        CliRun again = alerts("reopen", String.valueOf(scoreAlert), "--note", "twice", "--as", "T. Quill");
        assertEquals(Main.USAGE, again.exitCode(), again.out());
        assertTrue(again.err().contains("is not explained (it is OPEN)"), again.err());

        List<String> lines = alerts("history", String.valueOf(scoreAlert)).out().lines().toList();
        assertTrue(lines.stream().anyMatch(l -> l.contains("reopened by T. Quill")
                && l.contains("the bus line opened a year later")), String.join("\n", lines));
        CliRun noNote = alerts("reopen", String.valueOf(scoreAlert), "--as", "T. Quill");
        assertEquals(Main.USAGE, noNote.exitCode(), "a reopening without a note is refused: the history must say why");
        assertTrue(noNote.err().contains("--note"), noNote.err());
    }
}
