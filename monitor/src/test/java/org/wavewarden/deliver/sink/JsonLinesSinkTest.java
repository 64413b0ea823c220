package org.wavewarden.deliver.sink;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

class JsonLinesSinkTest {

    @TempDir
    Path dir;

    private List<String> lines(Path file) throws Exception {
        return Files.readAllLines(file, StandardCharsets.UTF_8);
    }

    @Test
    void sameBatchTwiceWritesItsLinesOnce() throws Exception {
        Path file = dir.resolve("alerts/survey.jsonl");
        JsonLinesSink sink = new JsonLinesSink(file, SinkFilter.all());
        List<AlertMessage> batch = Messages.batch();

        assertEquals(new DeliveryReport(sink.name(), 3, 0, 0, 3, 0), sink.deliver(batch));
        assertEquals(new DeliveryReport(sink.name(), 3, 0, 3, 0, 0), sink.deliver(batch));

        List<String> lines = lines(file);
        assertEquals(3, lines.size());
        for (int i = 0; i < 3; i++) {
            assertEquals(batch.get(i), AlertMessage.fromJson(lines.get(i)));
        }
    }

    @Test
    void aNewSinkOnTheSameFileStillSeesEarlierKeys() throws Exception {
        Path file = dir.resolve("survey.jsonl");
        new JsonLinesSink(file, SinkFilter.all()).deliver(Messages.batch().subList(0, 2));
        DeliveryReport r = new JsonLinesSink(file, SinkFilter.all()).deliver(Messages.batch());
        assertEquals(2, r.duplicates());
        assertEquals(1, r.delivered());
        assertEquals(3, lines(file).size());
    }

    @Test
    void repeatsInsideOneBatchAreWrittenOnce() throws Exception {
        Path file = dir.resolve("survey.jsonl");
        AlertMessage m = Messages.batch().get(0);
        DeliveryReport r = new JsonLinesSink(file, SinkFilter.all()).deliver(List.of(m, m, m));
        assertEquals(1, r.delivered());
        assertEquals(2, r.duplicates());
        assertEquals(1, lines(file).size());
    }

    @Test
    void filterDecidesWhatReachesTheFile() throws Exception {
        Path file = dir.resolve("survey.jsonl");
        JsonLinesSink sink = new JsonLinesSink(file, new SinkFilter(Verdict.MATERIAL, Set.of(FindingKind.BLANK)));
        DeliveryReport r = sink.deliver(Messages.batch());
        assertEquals(2, r.filteredOut());
        List<String> lines = lines(file);
        assertEquals(1, lines.size());
        assertEquals("age", AlertMessage.fromJson(lines.get(0)).variable());
    }

    @Test
    void nothingAcceptedLeavesNoFileBehind() {
        Path file = dir.resolve("survey.jsonl");
        new JsonLinesSink(file, new SinkFilter(Verdict.MATERIAL, Set.of(FindingKind.BLANK)))
                .deliver(Messages.batch().subList(1, 3));
        assertTrue(!Files.exists(file));
    }

    @Test
    void anUnfinishedLastLineFromAnInterruptedWriteIsReplacedNotContinued() throws Exception {
        Path file = dir.resolve("survey.jsonl");
        List<AlertMessage> batch = Messages.batch();
        JsonLinesSink sink = new JsonLinesSink(file, SinkFilter.all());
        sink.deliver(batch.subList(0, 1));
        // What a crash in the middle of the next batch's write can leave: a whole line, then half of one.
        String second = batch.get(1).toJson();
        Files.writeString(file, second + "\n" + batch.get(2).toJson().substring(0, 40), StandardOpenOption.APPEND);

        DeliveryReport r = sink.deliver(batch);
        assertEquals(2, r.duplicates());
        assertEquals(1, r.delivered());
        List<String> lines = lines(file);
        assertEquals(3, lines.size());
        for (int i = 0; i < 3; i++) {
            assertEquals(batch.get(i), AlertMessage.fromJson(lines.get(i)));
        }
    }

    @Test
    void aCompleteLastAlertWithoutItsNewlineIsKept() throws Exception {
        Path file = dir.resolve("survey.jsonl");
        List<AlertMessage> batch = Messages.batch();
        Files.writeString(file, batch.get(0).toJson());
        DeliveryReport r = new JsonLinesSink(file, SinkFilter.all()).deliver(batch);
        assertEquals(1, r.duplicates());
        List<String> lines = lines(file);
        assertEquals(3, lines.size());
        assertEquals(batch.get(0), AlertMessage.fromJson(lines.get(0)));
    }

    @Test
    void linesThatAreNotAlertsAreLeftAlone() throws Exception {
        Path file = dir.resolve("survey.jsonl");
        Files.writeString(file, "{\"note\":\"rotated on Monday\"}\n\n");
        new JsonLinesSink(file, SinkFilter.all()).deliver(Messages.batch());
        List<String> lines = new ArrayList<>(lines(file));
        assertEquals(5, lines.size());
        assertEquals("{\"note\":\"rotated on Monday\"}", lines.get(0));
    }
}
