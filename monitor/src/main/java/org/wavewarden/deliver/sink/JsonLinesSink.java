package org.wavewarden.deliver.sink;

import com.fasterxml.jackson.databind.JsonNode;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import org.wavewarden.deliver.Json;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.channels.FileLock;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Objects;
import java.util.Set;
import java.util.concurrent.ConcurrentHashMap;

/**
 * Appends alerts to a file, one JSON object per line (JSON Lines), for log shippers and for audits.
 *
 * <p><b>Idempotent.</b> Before each batch the whole file is read once and the idempotency keys already in it are
 * skipped, as are repeats inside the batch, so delivering the same batch twice writes its lines once. The cost is
 * one read of the file per batch and one key (64 characters) in memory per line: fine for the thousands to low
 * millions of lines a monitor writes in years; rotate the file beyond that, knowing that keys in a rotated-away
 * file are no longer seen.
 *
 * <p><b>Atomic per batch.</b> The new lines of a batch are rendered into one buffer, written at the end of the file
 * in a single write and forced to the disk before {@link #deliver} returns, so a returned report means the lines
 * are durable. If the process dies during the write, the file can end in a partial line; the next batch finds it
 * (the bytes after the last newline), removes it when it is not a complete alert, and the redelivered batch
 * writes the lost lines again while the keys of the lines that did land keep them from being doubled. A reader
 * tailing the file should therefore treat a last line without its newline as not yet written.
 *
 * <p>Writers in other processes are kept apart by an exclusive lock on the file, writers in this process by a
 * monitor per path.
 */
public final class JsonLinesSink implements AlertSink {

    private static final Logger LOG = LoggerFactory.getLogger(JsonLinesSink.class);
    private static final ConcurrentHashMap<Path, Object> IN_PROCESS = new ConcurrentHashMap<>();
    private static final int READ_CHUNK = 1 << 16;

    private final Path file;
    private final SinkFilter filter;

    public JsonLinesSink(Path file, SinkFilter filter) {
        this.file = Objects.requireNonNull(file, "file").toAbsolutePath().normalize();
        this.filter = Objects.requireNonNull(filter, "filter");
    }

    public Path file() {
        return file;
    }

    @Override
    public String name() {
        return "jsonLines:" + file;
    }

    @Override
    public SinkFilter filter() {
        return filter;
    }

    @Override
    public DeliveryReport deliver(List<AlertMessage> messages) {
        Objects.requireNonNull(messages, "messages");
        List<AlertMessage> accepted = messages.stream().filter(filter::accepts).toList();
        int filteredOut = messages.size() - accepted.size();
        if (accepted.isEmpty()) {
            return new DeliveryReport(name(), messages.size(), filteredOut, 0, 0, 0);
        }
        synchronized (IN_PROCESS.computeIfAbsent(file, p -> new Object())) {
            try {
                int written = append(accepted);
                return new DeliveryReport(name(), messages.size(), filteredOut, accepted.size() - written, written, 0);
            } catch (IOException e) {
                throw new UncheckedIOException("cannot append alerts to " + file + ": " + e.getMessage(), e);
            }
        }
    }

    /** Appends the messages whose keys are not yet in the file; returns how many lines were written. */
    private int append(List<AlertMessage> accepted) throws IOException {
        Path dir = file.getParent();
        if (dir != null) {
            Files.createDirectories(dir);
        }
        boolean created = !Files.exists(file);
        int written;
        try (FileChannel ch = FileChannel.open(file, StandardOpenOption.CREATE, StandardOpenOption.READ,
                StandardOpenOption.WRITE);
             FileLock ignored = ch.lock()) {
            Scan scan = scan(ch);
            long end = scan.end;
            ByteArrayOutputStream batch = new ByteArrayOutputStream();
            boolean changed = false;
            if (scan.tail != null) {
                if (scan.tailKey != null) {
                    // A complete alert that only lacks its newline (an edited file): keep it, finish its line.
                    scan.keys.add(scan.tailKey);
                    batch.write('\n');
                    end = ch.size();
                } else {
                    LOG.warn("{}: dropping {} bytes of an unfinished last line (an interrupted earlier write)",
                            name(), scan.tail.length);
                    ch.truncate(end);
                    changed = true;
                }
            }
            written = 0;
            for (AlertMessage m : accepted) {
                if (scan.keys.add(m.idempotencyKey())) {
                    batch.write(m.toJson().getBytes(StandardCharsets.UTF_8));
                    batch.write('\n');
                    written++;
                }
            }
            if (batch.size() > 0) {
                ByteBuffer buf = ByteBuffer.wrap(batch.toByteArray());
                long at = end;
                // One write call for the whole batch; the loop only matters if the OS takes fewer bytes.
                while (buf.hasRemaining()) {
                    at += ch.write(buf, at);
                }
                changed = true;
            }
            if (changed) {
                ch.force(true);
            }
        }
        if (created) {
            forceDirectory(dir);
        }
        return written;
    }

    /** What the file holds: keys of complete lines, where the last complete line ends, and any unfinished tail. */
    private static final class Scan {
        final Set<String> keys = new HashSet<>();
        long end;
        byte[] tail;
        String tailKey;
    }

    private Scan scan(FileChannel ch) throws IOException {
        Scan scan = new Scan();
        ByteBuffer buf = ByteBuffer.allocate(READ_CHUNK);
        ByteArrayOutputStream line = new ByteArrayOutputStream();
        long pos = 0;
        long lineNumber = 0;
        int unreadable = 0;
        while (true) {
            buf.clear();
            int n = ch.read(buf, pos);
            if (n < 0) {
                break;
            }
            byte[] a = buf.array();
            for (int i = 0; i < n; i++) {
                if (a[i] == '\n') {
                    lineNumber++;
                    String key = keyOf(line.toByteArray());
                    if (key != null) {
                        scan.keys.add(key);
                    } else if (line.size() > 0) {
                        unreadable++;
                    }
                    line.reset();
                    scan.end = pos + i + 1;
                } else {
                    line.write(a[i]);
                }
            }
            pos += n;
        }
        if (unreadable > 0) {
            LOG.warn("{}: {} of {} lines are not alerts and were ignored", name(), unreadable, lineNumber);
        }
        if (line.size() > 0) {
            scan.tail = line.toByteArray();
            scan.tailKey = keyOf(scan.tail);
        }
        return scan;
    }

    /** The idempotency key of a line, or null when the line is not a JSON object carrying one. */
    private static String keyOf(byte[] line) {
        if (line.length == 0) {
            return null;
        }
        try {
            JsonNode node = Json.mapper().readTree(line);
            JsonNode key = node == null ? null : node.get("idempotencyKey");
            return key != null && key.isTextual() ? key.asText() : null;
        } catch (IOException e) {
            return null;
        }
    }

    /** Makes a new file's directory entry durable too; not every platform allows it, so failure is not an error. */
    private static void forceDirectory(Path dir) {
        if (dir == null) {
            return;
        }
        try (FileChannel d = FileChannel.open(dir, StandardOpenOption.READ)) {
            d.force(true);
        } catch (IOException | UnsupportedOperationException e) {
            LOG.debug("cannot force directory {}: {}", dir, e.toString());
        }
    }

    @Override
    public String toString() {
        return name();
    }
}
