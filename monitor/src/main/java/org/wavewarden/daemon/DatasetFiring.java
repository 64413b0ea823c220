package org.wavewarden.daemon;

import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.Identifiers;
import org.wavewarden.deliver.FindingsFiles;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.deliver.OutputPaths;
import org.wavewarden.pipeline.JudgedWave;
import org.wavewarden.pipeline.Session;
import org.wavewarden.pipeline.WaveJudge;
import org.wavewarden.read.WaveInfo;
import org.wavewarden.read.WaveListing;
import org.wavewarden.read.WaveSource;
import org.wavewarden.store.OutboxStore;
import org.wavewarden.store.ResultsStore;

import java.nio.file.Path;
import java.time.Clock;
import java.time.Instant;
import java.time.ZoneOffset;
import java.time.format.DateTimeFormatter;
import java.time.temporal.ChronoUnit;
import java.util.ArrayList;
import java.util.List;

/**
 * One firing for one dataset: list the source's waves with a content fingerprint, and judge, oldest first, every
 * wave that has no current run or whose rows changed since its run (count or fingerprint), once the wave is ready (its row count
 * unchanged for the dataset's quiet period, and listed in the readiness table when one is configured). Waves after
 * one that is not ready wait too, since they are compared against it.
 */
public final class DatasetFiring {

    private static final Logger LOG = LoggerFactory.getLogger(DatasetFiring.class);
    private static final DateTimeFormatter STAMP = DateTimeFormatter.ofPattern("yyyyMMdd'T'HHmmss'Z'")
            .withZone(ZoneOffset.UTC);

    private final Session session;
    private final Clock clock;
    private final Path outputDir;
    private final List<String> alertSinks;
    private final List<String> rollUpSinks;
    private final boolean digest;

    /** A firing whose runs owe their wave files only, which it writes before it returns. */
    public DatasetFiring(Session session, Clock clock, Path outputDir) {
        this(session, clock, outputDir, List.of(), false);
    }

    /**
     * @param alertSinks the names of the sinks every alert goes to
     * @param digest     whether the firing's judged waves owe a digest of their own; such a firing is the daemon's,
     *                   whose delivery step writes every file, so this firing writes none itself
     */
    public DatasetFiring(Session session, Clock clock, Path outputDir, List<String> alertSinks, boolean digest) {
        this(session, clock, outputDir, alertSinks, List.of(), digest);
    }

    /** @param rollUpSinks the names of the sinks that get one roll-up of the firing's new alerts */
    public DatasetFiring(Session session, Clock clock, Path outputDir, List<String> alertSinks,
                         List<String> rollUpSinks, boolean digest) {
        this.rollUpSinks = List.copyOf(rollUpSinks);
        this.session = session;
        this.clock = clock;
        this.outputDir = outputDir;
        this.alertSinks = List.copyOf(alertSinks);
        this.digest = digest;
    }

    /**
     * What one firing did.
     *
     * @param found the waves the source lists
     */
    public record Result(String dataset, int found, List<JudgedWave> judged, List<String> waiting) {
    }

    /**
     * Judges every ready wave, each committed with its outputs as outbox rows, then (unless the delivery step does)
     * writes the judged waves' findings files; a wave whose files cannot be written stays judged and its files
     * stay owed.
     */
    public Result fire(DatasetConfig d) {
        Path datasetDir = OutputPaths.under(outputDir, d.name());
        Path firing = datasetDir.resolve("digest-" + STAMP.format(clock.instant()));
        Path digestFolder = digest ? firing : null;
        WaveJudge judge = new WaveJudge(session, clock);
        ResultsStore store = session.store();
        List<JudgedWave> judged = new ArrayList<>();
        List<String> waiting = new ArrayList<>();
        boolean blocked = false;
        List<WaveInfo> waves = session.source().withHandle(h -> WaveListing.list(h, WaveSource.of(d, "dataset"),
                d.waveOrder(), true));
        for (WaveInfo w : waves) {
            var run = store.currentRun(d.name(), w.wave());
            if (run.isPresent() && unchanged(d, w, run.get())) {
                continue;
            }
            // The database keeps microseconds and rounds to them: a finer clock reading could come back later
            // than itself and hold a wave with no quiet period until the next firing.
            Instant now = clock.instant().truncatedTo(ChronoUnit.MICROS);
            Instant stableSince = store.watch(d.name(), w.wave(), w.rows(), w.fingerprint(), now);
            // Later waves are still watched, so their quiet periods run at the same time, but none is judged
            // before the waves it is compared against.
            if (blocked || stableSince.plus(d.quietPeriod()).isAfter(now) || !released(d, w.wave())) {
                waiting.add(w.wave());
                blocked = true;
                continue;
            }
            judged.add(judge.judgeWithOutputs(d, w.wave(), null, new OutboxStore.Outputs(
                    OutputPaths.under(datasetDir, w.wave()), digestFolder, alertSinks, rollUpSinks, firing), null));
            store.judgedFingerprint(d.name(), w.wave(), w.fingerprint());
        }
        for (JudgedWave j : digest ? List.<JudgedWave>of() : judged) {
            for (OutboxStore.Row row : store.outbox().pendingWaveFiles(j.runId())) {
                try {
                    FindingsFiles.carryOut(store, row);
                } catch (RuntimeException e) {
                    LOG.warn("{} wave {}: the findings files stay owed: {}", d.name(), j.report().wave(),
                            e.toString());
                }
            }
        }
        return new Result(d.name(), waves.size(), judged, waiting);
    }

    /**
     * A judged wave is unchanged when its source fingerprint (row count and row hashes) is the one recorded when
     * it was judged; a run made outside the daemon (by {@code check}) has no fingerprint, and then the row count of
     * the summary it judged is compared.
     */
    private boolean unchanged(DatasetConfig d, WaveInfo w, ResultsStore.RunRecord run) {
        var judgedFingerprint = session.store().judgedFingerprint(d.name(), w.wave());
        if (judgedFingerprint.isPresent()) {
            return judgedFingerprint.get() == w.fingerprint()
                    && session.store().summaryRows(d.name(), w.wave(), run.summaryChecksum()) == w.rows();
        }
        return session.store().summaryRows(d.name(), w.wave(), run.summaryChecksum()) == w.rows();
    }

    /** With a readiness table configured, whether it lists the wave; without one, every wave is released. */
    boolean released(DatasetConfig d, String wave) {
        if (d.readyTable() == null) {
            return true;
        }
        Identifiers.TableName t = Identifiers.TableName.parse("readyTable", d.readyTable());
        return session.source().withHandle(h -> h.createQuery("SELECT count(*) FROM " + t.quoted() + " WHERE "
                + Identifiers.quote(d.readyColumn()) + "::text = :wave").bind("wave", wave).mapTo(Long.class).one() > 0);
    }

    public static List<FindingsReport> reports(Result r) {
        return r.judged().stream().map(JudgedWave::report).toList();
    }
}
