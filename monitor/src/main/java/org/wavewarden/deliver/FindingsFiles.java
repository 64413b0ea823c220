package org.wavewarden.deliver;

import com.fasterxml.jackson.databind.SerializationFeature;
import org.wavewarden.judge.Finding;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Comparator;
import java.util.List;

/** Writes a judged wave's outputs: {@code findings.json} and the Markdown digest, into a folder per wave. */
public final class FindingsFiles {

    private FindingsFiles() {
    }

    /** Findings in reading order: most urgent verdict first, then by size relative to threshold. */
    public static List<Finding> ordered(List<Finding> findings) {
        return findings.stream().sorted(Comparator.comparingDouble(Finding::urgency)
                .thenComparing(Finding::variable).thenComparing(f -> f.kind().name())).toList();
    }

    public static Path write(Path dir, FindingsReport report) {
        try {
            Files.createDirectories(dir);
            Path json = dir.resolve("findings.json");
            Files.writeString(json, Json.mapper().writer().with(SerializationFeature.INDENT_OUTPUT)
                    .writeValueAsString(report) + "\n", StandardCharsets.UTF_8);
            Files.writeString(dir.resolve("digest.md"), MarkdownDigest.render(List.of(report)), StandardCharsets.UTF_8);
            return json;
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write findings to " + dir, e);
        }
    }

    public static FindingsReport read(Path json) {
        try {
            return Json.mapper().readValue(Files.readString(json), FindingsReport.class);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read " + json, e);
        }
    }
}
