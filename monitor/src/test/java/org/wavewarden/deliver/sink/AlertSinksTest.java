package org.wavewarden.deliver.sink;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

class AlertSinksTest {

    @TempDir
    Path dir;

    /** A sink whose storage is gone. */
    private static AlertSink broken(String name) {
        return new AlertSink() {
            @Override
            public String name() {
                return name;
            }

            @Override
            public SinkFilter filter() {
                return SinkFilter.all();
            }

            @Override
            public DeliveryReport deliver(List<AlertMessage> messages) {
                throw new IllegalStateException(name + " is full");
            }
        };
    }

    @Test
    void aFailingSinkDoesNotKeepTheOthersFromTheirTurn() throws Exception {
        Path file = dir.resolve("a.jsonl");
        AlertSinks sinks = new AlertSinks(List.of(broken("first"), new JsonLinesSink(file, SinkFilter.all()),
                broken("third")));

        IllegalStateException e = assertThrows(IllegalStateException.class, () -> sinks.deliver(Messages.batch()));

        assertEquals("first is full", e.getMessage());
        assertEquals(1, e.getSuppressed().length);
        assertEquals(3, Files.readAllLines(file).size());
    }

    @Test
    void reportsOnePerSink() {
        AlertSinks sinks = new AlertSinks(List.of(new JsonLinesSink(dir.resolve("a.jsonl"), SinkFilter.all()),
                new JsonLinesSink(dir.resolve("b.jsonl"), SinkFilter.of("MATERIAL", List.of("BLANK")))));
        List<DeliveryReport> reports = sinks.deliver(Messages.batch());
        assertEquals(List.of(3, 1), reports.stream().map(DeliveryReport::delivered).toList());
    }

    @Test
    void aReportWhoseCountsDoNotAddUpIsRefused() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> new DeliveryReport("s", 3, 1, 0, 1, 0));
        assertEquals("offered", e.getMessage().substring(0, e.getMessage().indexOf(':')));
    }
}
