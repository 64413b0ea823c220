package org.wavewarden.cli;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.Test;
import org.slf4j.LoggerFactory;
import org.wavewarden.deliver.Json;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The log format chosen by {@code WAVEWARDEN_LOG_FORMAT}, in a child JVM with the project's own logging config, as
 * every command gets it.
 */
class LogFormatTest {

    /** What the child logs: a message with a line break and a quote, and one with a stack trace. */
    public static final class Speaker {
        public static void main(String[] args) {
            var log = LoggerFactory.getLogger("org.wavewarden.daemon.Daemon");
            log.warn("firing of {} failed:\nsecond line with \"quotes\"", "labour");
            log.error("could not write the digest", new IllegalStateException("disk full"));
        }
    }

    static List<String> stderrOfChild(Map<String, String> env) throws IOException, InterruptedException {
        List<String> cmd = List.of(Path.of(System.getProperty("java.home"), "bin", "java").toString(), "-Xmx64m",
                "-cp", System.getProperty("java.class.path"), Speaker.class.getName());
        ProcessBuilder pb = new ProcessBuilder(cmd);
        pb.environment().remove("WAVEWARDEN_LOG_FORMAT");
        pb.environment().putAll(env);
        Process p = pb.redirectOutput(ProcessBuilder.Redirect.DISCARD).start();
        String err = new String(p.getErrorStream().readAllBytes(), StandardCharsets.UTF_8);
        assertTrue(p.waitFor(60, TimeUnit.SECONDS), "the child exited");
        assertEquals(0, p.exitValue(), err);
        return err.lines().toList();
    }

    @Test
    void jsonFormatWritesOneJsonObjectPerLine() throws Exception {
        List<String> lines = stderrOfChild(Map.of("WAVEWARDEN_LOG_FORMAT", "json"));
        List<JsonNode> events = new ArrayList<>();
        for (String line : lines) {
            JsonNode node = Json.mapper().readTree(line);
            assertTrue(node.isObject(), "not one JSON object: " + line);
            events.add(node);
        }
        assertEquals(2, events.size(), String.join("\n", lines));
        assertEquals("WARN", events.get(0).get("level").asText());
        assertEquals("org.wavewarden.daemon.Daemon", events.get(0).get("loggerName").asText());
        assertEquals("firing of labour failed:\nsecond line with \"quotes\"",
                events.get(0).get("formattedMessage").asText());
        assertEquals("ERROR", events.get(1).get("level").asText());
        assertTrue(events.get(1).get("throwable").toString().contains("disk full"), events.get(1).toString());
    }

    @Test
    void textFormatIsTheDefault() throws Exception {
        List<String> lines = stderrOfChild(Map.of());
        assertTrue(lines.get(0).matches("\\d\\d:\\d\\d:\\d\\d\\.\\d{3} WARN  org\\.wavewarden\\.daemon\\.Daemon - "
                + "firing of labour failed:"), lines.get(0));
        assertTrue(lines.stream().anyMatch(l -> l.contains("java.lang.IllegalStateException: disk full")));
    }

    @Test
    void anUnknownFormatFallsBackToTextRatherThanLosingTheLog() throws Exception {
        List<String> lines = stderrOfChild(Map.of("WAVEWARDEN_LOG_FORMAT", "xml"));
        assertTrue(lines.get(0).contains("WARN  org.wavewarden.daemon.Daemon - firing of labour failed:"),
                String.join("\n", lines));
    }
}
