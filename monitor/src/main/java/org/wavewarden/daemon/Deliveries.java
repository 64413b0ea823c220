package org.wavewarden.daemon;

import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.deliver.FindingsFiles;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.deliver.Json;
import org.wavewarden.deliver.MarkdownDigest;
import org.wavewarden.deliver.sink.AlertMessage;
import org.wavewarden.deliver.sink.AlertSink;
import org.wavewarden.deliver.sink.DeliveryReport;
import org.wavewarden.deliver.sink.JdbiDeadLetters;
import org.wavewarden.deliver.sink.RetryPolicy;
import org.wavewarden.deliver.sink.RollUp;
import org.wavewarden.deliver.sink.UndeliveredException;
import org.wavewarden.judge.Finding;
import org.wavewarden.review.AlertState;
import org.wavewarden.store.AlertReviews;
import org.wavewarden.pipeline.DigestAssembler;
import org.wavewarden.pipeline.FaultPoints;
import org.wavewarden.pipeline.Session;
import org.wavewarden.store.OutboxStore;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * Carries out what committed runs owe, from the outbox table: the findings files and digests, then each alert
 * sink in turn, each a step of its own. A failing step delays only itself: its rows stay owed and are tried again
 * by the next firing, and the steps after it run as usual. Every step is idempotent (files are rewritten whole
 * from the stored results; alerts carry their idempotency key, which the JSON Lines sink and receivers use to drop
 * a repeat), so a row carried out again after a crash between doing and recording is harmless.
 *
 * <p>A sink stops for the rest of a firing at its first failure: a receiver that is down then costs one alert's
 * attempts per firing, not every alert's. A webhook alert that the sink gave up on is dead-lettered and tried again
 * by later firings after a backoff that doubles with each time it died ({@link RetryPolicy#ceiling}), or at once
 * when replayed; a later success marks it delivered and removes its dead letter. Only an unreachable results
 * database escapes a step (its failure cannot be recorded), so that the firing is retried.
 *
 * <p>An alert row is sent only while its alert is open ({@link AlertReviews#states}): one explained (by an
 * expected change at creation, or by a person since) or muted is marked {@code withheld} with its state, and
 * shows in the digest instead. A sink can also (or instead) take one {@link RollUp} per firing: rendered here from
 * the stored results of the firing's runs and the alerts' states now, it lists the open alerts its filter takes
 * and counts the rest; one with nothing new is withheld. A roll-up or an e-mail the sink gave up on
 * ({@link UndeliveredException}) is marked dead with the reason and tried again after the same backoff.
 */
public final class Deliveries {

    private static final Logger LOG = LoggerFactory.getLogger(Deliveries.class);
    /** Fault point: just before the HTML digest of a firing is rendered. */
    public static final String RENDER_HTML_DIGEST = "render-html-digest";
    /** Fault point: an alert was handed to its sink and the outbox does not yet know. */
    public static final String AFTER_SEND = "after-send";
    /**
     * Dead letters are tried again after 1 minute, then every 2 minutes. The wait is short because it is what a
     * receiver back from an outage waits for its alerts, and trying costs little: a sink stops at its first failure
     * in each pass, so a long outage costs one message's attempts per pass however many are owed. (A 30-minute
     * soak with waits doubling up to an hour left two alerts waiting 8 minutes after the receiver was back.)
     */
    public static final RetryPolicy DEAD_LETTER_BACKOFF = RetryPolicy.of(1, Duration.ofMinutes(1),
            Duration.ofMinutes(2));

    private final Session session;
    private final OutboxStore outbox;
    private final Map<String, List<AlertSink>> sinksByDataset;
    private final Clock clock;
    private final RetryPolicy deadLetterBackoff;
    private volatile Path latestDigest;

    /** What one step did in one firing, and what its sink still owes afterwards. */
    public record SinkOutcome(String sink, int delivered, int failed, long pending, long dead) {
        public boolean owesNothing() {
            return pending == 0 && dead == 0;
        }
    }

    /** What one delivery pass of a dataset did, per sink, files first. */
    public record Outcome(String dataset, List<SinkOutcome> sinks, Duration took) {
        public Outcome {
            sinks = List.copyOf(sinks);
        }

        public boolean owesNothing() {
            return sinks.stream().allMatch(SinkOutcome::owesNothing);
        }
    }

    public Deliveries(Session session, Map<String, List<AlertSink>> sinksByDataset, Clock clock,
                      RetryPolicy deadLetterBackoff) {
        this.session = session;
        this.outbox = session.store().outbox();
        this.sinksByDataset = Map.copyOf(sinksByDataset);
        this.clock = clock;
        this.deadLetterBackoff = deadLetterBackoff;
    }

    /** The names of a dataset's sinks that take each alert on its own, which its runs write outbox rows for. */
    List<String> sinkNames(String dataset) {
        return sinksByDataset.getOrDefault(dataset, List.of()).stream().filter(x -> x.messages().perAlert())
                .map(AlertSink::name).toList();
    }

    /** The names of a dataset's sinks that take one roll-up per firing. */
    List<String> rollUpSinkNames(String dataset) {
        return sinksByDataset.getOrDefault(dataset, List.of()).stream().filter(x -> x.messages().perFiring())
                .map(AlertSink::name).toList();
    }

    /** Carries out everything of the dataset that is due. */
    public Outcome deliver(String dataset) {
        long started = System.nanoTime();
        List<Step> steps = new ArrayList<>();
        steps.add(files(dataset));
        for (AlertSink sink : sinksByDataset.getOrDefault(dataset, List.of())) {
            // A sink sent only roll-ups owes no alert on its own, not even those of runs made without it.
            if (sink.messages().perAlert()) {
                outbox.enrolAlerts(dataset, sink.name());
            }
            steps.add(alerts(dataset, sink));
        }
        Map<String, OutboxStore.Backlog> owed = new java.util.HashMap<>();
        for (OutboxStore.Backlog b : outbox.backlog(dataset)) {
            owed.put(b.sink(), b);
        }
        List<SinkOutcome> out = new ArrayList<>();
        for (Step s : steps) {
            OutboxStore.Backlog b = owed.get(s.sink);
            out.add(new SinkOutcome(s.sink, s.delivered, s.failed, b == null ? 0 : b.pending(),
                    b == null ? 0 : b.deadLetters()));
        }
        return new Outcome(dataset, out, Duration.ofNanos(System.nanoTime() - started));
    }

    /** Counts of one step. */
    private static final class Step {
        final String sink;
        int delivered;
        int failed;

        Step(String sink) {
            this.sink = sink;
        }
    }

    private Step files(String dataset) {
        Step step = new Step(OutboxStore.FILES);
        for (OutboxStore.Row row : outbox.due(dataset, OutboxStore.FILES, clock.instant())) {
            try {
                if (row.product().equals(OutboxStore.WAVE_FILES)) {
                    FindingsFiles.carryOut(session.store(), row);
                } else {
                    digest(row);
                }
                step.delivered++;
            } catch (RuntimeException e) {
                if (row.product().equals(OutboxStore.FIRING_DIGEST)) {
                    outbox.failed(row.id(), e.toString());
                }
                step.failed++;
                LOG.warn("{}: {} for {} stays pending: {}", dataset, row.product(), row.folder(), e.toString());
            }
        }
        return step;
    }

    /**
     * Writes a firing's digest (Markdown, JSON, HTML) from the stored results of its runs, and copies it into
     * {@code latest} unless a newer firing's digest exists.
     */
    private void digest(OutboxStore.Row row) {
        DatasetConfig d = session.config().datasets().stream().filter(x -> x.name().equals(row.dataset()))
                .findFirst().orElseThrow(() -> new IllegalStateException("dataset " + row.dataset()
                        + " is no longer configured"));
        List<FindingsReport> reports = row.runIds().stream().map(session.store()::storedReport)
                .flatMap(Optional::stream).toList();
        Instant now = clock.instant();
        String md = new DigestAssembler(session).markdown(d, reports, "../");
        String json = Json.write(Map.of("dataset", row.dataset(), "generatedAt", now.toString(), "waves", reports));
        FaultPoints.hit(RENDER_HTML_DIGEST);
        String html = new DigestAssembler(session).html(d, reports, now);
        Path dir = row.folder();
        Map<String, String> files = new java.util.LinkedHashMap<>();
        files.put("digest.md", md);
        files.put("digest.json", json);
        files.put("digest.html", html);
        try {
            Files.createDirectories(dir);
            for (var f : files.entrySet()) {
                FindingsFiles.writeAtomically(dir.resolve(f.getKey()), f.getValue());
            }
            if (outbox.newestDigest(row.dataset()) == row.id()) {
                Path latest = dir.getParent().resolve("latest");
                Files.createDirectories(latest);
                for (var f : files.entrySet()) {
                    FindingsFiles.writeAtomically(latest.resolve(f.getKey()), f.getValue());
                }
                latestDigest = latest.resolve("digest.md");
            }
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write the digest to " + dir + ": " + e.getMessage(), e);
        }
        outbox.delivered(row.id());
    }

    private Step alerts(String dataset, AlertSink sink) {
        Step step = new Step(sink.name());
        for (OutboxStore.Row row : outbox.due(dataset, sink.name(), clock.instant())) {
            if (row.product().equals(OutboxStore.ROLL_UP)) {
                if (!rollUp(dataset, sink, row, step)) {
                    break;
                }
                continue;
            }
            // An alert explained or muted (at creation, or by a person since) is recorded and shown in the digest,
            // never sent on its own.
            AlertState state = row.alertId() == null ? null : reviews().states(List.of(row.alertId()))
                    .get(row.alertId());
            if (state == AlertState.EXPLAINED || state == AlertState.MUTED) {
                outbox.withheld(row.id(), state.name());
                continue;
            }
            Optional<AlertMessage> m = state == null || state == AlertState.SUPERSEDED ? Optional.empty()
                    : outbox.message(row.alertId());
            if (m.isEmpty()) {
                outbox.superseded(row.id());
                continue;
            }
            if (!sink.filter().accepts(m.get())) {
                outbox.filtered(row.id());
                continue;
            }
            DeliveryReport r;
            try {
                r = sink.deliver(List.of(m.get()));
            } catch (UndeliveredException e) {
                dead(dataset, sink, row, e, step);
                break;
            } catch (RuntimeException e) {
                outbox.failed(row.id(), e.getMessage() == null ? e.toString() : e.getMessage());
                step.failed++;
                LOG.warn("{}: {} failed and waits for the next firing; its alerts stay pending: {}", dataset,
                        sink.name(), e.getMessage());
                break;
            }
            FaultPoints.hit(AFTER_SEND);
            if (r.deadLettered() > 0) {
                String error = deadLetters().lastError(sink.name(), m.get().idempotencyKey())
                        .orElse("the receiver did not take it");
                Instant retryAt = clock.instant().plus(deadLetterBackoff.ceiling(row.deadCount() + 1));
                outbox.dead(row.id(), error, retryAt);
                step.failed++;
                LOG.warn("{}: {} gave up on {} {} of wave {}; tried again after {}; the sink waits for the next"
                        + " firing", dataset, sink.name(), m.get().kind(), m.get().variable(), m.get().wave(), retryAt);
                break;
            }
            if (r.filteredOut() > 0) {
                outbox.filtered(row.id());
                continue;
            }
            outbox.delivered(row.id());
            if (row.deadCount() > 0) {
                deadLetters().remove(sink.name(), m.get().idempotencyKey());
            }
            step.delivered++;
        }
        return step;
    }

    /**
     * Carries out a roll-up row: renders it from the stored results of its runs and the alerts' states now, and
     * hands it to the sink; a roll-up with nothing new is withheld.
     *
     * @return false when the sink failed and waits for the next firing
     */
    private boolean rollUp(String dataset, AlertSink sink, OutboxStore.Row row, Step step) {
        RollUp r = rollUpOf(dataset, sink, row);
        if (r.alerts().isEmpty()) {
            outbox.withheld(row.id(), "nothing new: " + r.notSent().total() + " not sent on their own");
            return true;
        }
        try {
            sink.deliverRollUp(r);
        } catch (UndeliveredException e) {
            dead(dataset, sink, row, e, step);
            return false;
        } catch (RuntimeException e) {
            outbox.failed(row.id(), e.getMessage() == null ? e.toString() : e.getMessage());
            step.failed++;
            LOG.warn("{}: the roll-up to {} failed and waits for the next firing: {}", dataset, sink.name(),
                    e.getMessage());
            return false;
        }
        FaultPoints.hit(AFTER_SEND);
        outbox.delivered(row.id());
        step.delivered++;
        return true;
    }

    /** The roll-up of one row for one sink, as it stands now. */
    RollUp rollUpOf(String dataset, AlertSink sink, OutboxStore.Row row) {
        List<Long> ids = outbox.rollUpAlerts(row);
        Map<Long, AlertState> states = ids.isEmpty() ? Map.of() : reviews().states(ids);
        List<AlertMessage> fresh = new ArrayList<>();
        int explained = 0;
        int muted = 0;
        int notForThisSink = 0;
        for (long id : ids) {
            AlertState st = states.get(id);
            if (st == AlertState.EXPLAINED) {
                explained++;
            } else if (st == AlertState.MUTED) {
                muted++;
            } else if (st == AlertState.OPEN) {
                Optional<AlertMessage> m = outbox.message(id);
                if (m.isPresent() && sink.filter().accepts(m.get())) {
                    fresh.add(m.get());
                } else if (m.isPresent()) {
                    notForThisSink++;
                }
            }
        }
        Map<String, Integer> repeats = outbox.repeats(row.runIds());
        RollUp.NotSent notSent = new RollUp.NotSent(explained, muted,
                repeats.getOrDefault(Finding.Repeat.Kind.STILL_PRESENT.name(), 0),
                repeats.getOrDefault(Finding.Repeat.Kind.STILL_UNRESOLVABLE.name(), 0), notForThisSink);
        String firing = Path.of(row.item().substring(row.item().indexOf(" of ") + 4)).getFileName().toString();
        return new RollUp(dataset, firing, row.runIds(), fresh, notSent, digestLink(dataset, row.folder()),
                RollUp.idempotencyKey(dataset, sink.name(), row.item()));
    }

    /**
     * {@code <digestBaseUrl>/<dataset folder>/<firing folder>/digest.html}: the daemon's output folder as published
     * under the base URL. The folder names are made by {@link org.wavewarden.deliver.OutputPaths} and the firing's
     * time stamp, so they hold only letters, digits, '.', '-' and '_' and need no escaping in a URL.
     */
    private String digestLink(String dataset, Path digestFolder) {
        String base = session.config().datasets().stream().filter(x -> x.name().equals(dataset)).findFirst()
                .map(d -> d.alerts().digestBaseUrl()).orElse(null);
        if (base == null || digestFolder == null || digestFolder.getParent() == null) {
            return null;
        }
        return base + "/" + digestFolder.getParent().getFileName() + "/" + digestFolder.getFileName()
                + "/digest.html";
    }

    private void dead(String dataset, AlertSink sink, OutboxStore.Row row, UndeliveredException e, Step step) {
        Instant retryAt = clock.instant().plus(deadLetterBackoff.ceiling(row.deadCount() + 1));
        outbox.dead(row.id(), e.getMessage(), retryAt);
        step.failed++;
        LOG.warn("{}: {} gave up on {} after {} attempt(s): {}; tried again after {}; the sink waits for the next"
                + " firing", dataset, sink.name(), row.product(), e.attempts(), e.getMessage(), retryAt);
    }

    private AlertReviews reviews() {
        return new AlertReviews(session.store().jdbi(), session.config().results().schema());
    }

    private JdbiDeadLetters deadLetters() {
        return new JdbiDeadLetters(session.store().jdbi(), session.config().results().schema());
    }

    Path latestDigest() {
        return latestDigest;
    }
}
