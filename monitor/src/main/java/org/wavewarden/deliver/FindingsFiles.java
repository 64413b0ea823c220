package org.wavewarden.deliver;

import com.fasterxml.jackson.databind.SerializationFeature;
import org.wavewarden.judge.Finding;
import org.wavewarden.store.OutboxStore;
import org.wavewarden.store.ResultsStore;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.util.List;

/** Writes a judged wave's outputs: {@code findings.json} and the Markdown digest, into a folder per wave. */
public final class FindingsFiles {

    private FindingsFiles() {
    }

    /** The name of a case list's file: the finding id, then safe characters (see {@code CaseList.fileName}). */
    private static final java.util.regex.Pattern CASE_FILE = java.util.regex.Pattern.compile("[0-9]+-[A-Za-z0-9_-]+\\.csv");

    /** Findings in reading order: most urgent verdict first, then by size relative to threshold. */
    public static List<Finding> ordered(List<Finding> findings) {
        return org.wavewarden.judge.WaveVerdicts.ordered(findings);
    }

    /**
     * Writes {@code findings.json} and {@code digest.md} into {@code dir}, each atomically: a reader (or a crash)
     * sees the old file or the new one, never half of one.
     */
    public static Path write(Path dir, FindingsReport report) {
        return write(dir, report, List.of());
    }

    /**
     * The same with the run's case lists, each a CSV file under {@code cases/} (see {@link CaseListCsv}), written
     * before the digest that links them and before {@code findings.json}, so a reader who sees the findings sees
     * their lists.
     */
    public static Path write(Path dir, FindingsReport report, List<org.wavewarden.store.CaseLists.CaseList> cases) {
        try {
            Files.createDirectories(dir);
            if (!cases.isEmpty()) {
                Files.createDirectories(dir.resolve("cases"));
            }
            java.util.Set<Path> listed = new java.util.HashSet<>();
            for (org.wavewarden.store.CaseLists.CaseList list : cases) {
                Path file = dir.resolve(list.fileName());
                writeAtomically(file, CaseListCsv.render(list));
                listed.add(file.getFileName());
            }
            // A list of an earlier run of this wave (its findings replaced by this run's) would be taken for one of
            // this run's: only files named as lists are, and only those this run did not write, removed.
            Path folder = dir.resolve("cases");
            if (Files.isDirectory(folder)) {
                try (var old = Files.list(folder)) {
                    for (Path p : old.filter(p -> CASE_FILE.matcher(p.getFileName().toString()).matches()
                            && !listed.contains(p.getFileName())).toList()) {
                        Files.deleteIfExists(p);
                    }
                }
            }
            Path json = dir.resolve("findings.json");
            writeAtomically(json, Json.mapper().writer().with(SerializationFeature.INDENT_OUTPUT)
                    .writeValueAsString(report) + "\n");
            writeAtomically(dir.resolve("digest.md"), MarkdownDigest.render(List.of(report), DigestRecords.NONE
                    .withCaseLinks(cases.stream().map(c -> CaseLink.of(report.dataset(), report.wave(), c))
                            .toList())));
            return json;
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write findings to " + dir, e);
        }
    }

    /**
     * Carries out one {@code wave-files} row of the outbox: the files are made again from the results schema (the
     * stored run and findings), written, and the row marked delivered. A failure is recorded on the row, which stays
     * pending for the next attempt, and thrown.
     */
    public static Path carryOut(ResultsStore store, OutboxStore.Row row) {
        try {
            long runId = row.runIds().get(0);
            FindingsReport report = store.storedReport(runId).orElseThrow(() -> new IllegalStateException(
                    "run " + runId + " is no longer in the results schema"));
            Path json = write(row.folder(), report, store.caseLists().forRun(runId));
            store.outbox().delivered(row.id());
            return json;
        } catch (RuntimeException e) {
            store.outbox().failed(row.id(), e.getMessage() == null ? e.toString() : e.getMessage());
            throw e;
        }
    }

    /**
     * Replaces {@code file} with {@code text} in UTF-8 through a temporary file in the same folder, forced to the
     * disk and renamed over the target in one step, so a half-written file is never seen under the real name.
     */
    public static void writeAtomically(Path file, String text) throws IOException {
        Path dir = file.toAbsolutePath().getParent();
        Path tmp = Files.createTempFile(dir, "." + file.getFileName(), ".tmp");
        try {
            try (FileChannel ch = FileChannel.open(tmp, StandardOpenOption.WRITE, StandardOpenOption.TRUNCATE_EXISTING)) {
                ByteBuffer buf = ByteBuffer.wrap(text.getBytes(StandardCharsets.UTF_8));
                while (buf.hasRemaining()) {
                    ch.write(buf);
                }
                ch.force(true);
            }
            Files.move(tmp, file, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
        } finally {
            Files.deleteIfExists(tmp);
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
