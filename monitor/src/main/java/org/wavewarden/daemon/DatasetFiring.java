package org.wavewarden.daemon;

import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.Identifiers;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.pipeline.JudgedWave;
import org.wavewarden.pipeline.Session;
import org.wavewarden.pipeline.WaveJudge;
import org.wavewarden.read.WaveInfo;
import org.wavewarden.read.WaveListing;
import org.wavewarden.read.WaveSource;
import org.wavewarden.store.ResultsStore;

import java.nio.file.Path;
import java.time.Clock;
import java.time.Instant;
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

    private final Session session;
    private final Clock clock;
    private final Path outputDir;

    public DatasetFiring(Session session, Clock clock, Path outputDir) {
        this.session = session;
        this.clock = clock;
        this.outputDir = outputDir;
    }

    /** What one firing did. */
    public record Result(String dataset, List<JudgedWave> judged, List<String> waiting) {
    }

    public Result fire(DatasetConfig d) {
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
            judged.add(judge.judge(d, w.wave(), null, outputDir.resolve(d.name()).resolve(w.wave()), null));
            store.judgedFingerprint(d.name(), w.wave(), w.fingerprint());
        }
        return new Result(d.name(), judged, waiting);
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
