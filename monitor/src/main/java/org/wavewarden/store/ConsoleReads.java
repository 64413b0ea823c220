package org.wavewarden.store;

import org.jdbi.v3.core.Jdbi;
import org.wavewarden.judge.Finding;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.AlertView;
import org.wavewarden.review.ReviewEntry;
import org.wavewarden.review.SignOff;

import java.time.Instant;
import java.util.Comparator;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;

/**
 * What the web console reads from the results schema, one bounded number of statements per page whatever the
 * history's size (no statement per row): the datasets overview, a dataset's variables-by-waves grid, a finding with
 * its trend and alert history, a wave with its alerts and sign-offs, and search by variable name.
 *
 * <p>A wave's findings are those of its current run: the latest run of the (dataset, wave) that is not superseded.
 * Waves are returned in the order the caller's comparator gives (the dataset's configured wave order).
 */
public final class ConsoleReads {

    private final Jdbi jdbi;
    private final String schema;

    public ConsoleReads(Jdbi jdbi, String schema) {
        this.jdbi = Objects.requireNonNull(jdbi, "jdbi");
        this.schema = Objects.requireNonNull(schema, "schema");
    }

    /**
     * One dataset as the overview shows it.
     *
     * @param lastWave      the wave of the latest current run, or null before the first run
     * @param lastJudgedAt  when that run finished, or null
     * @param wavesJudged   waves with a current run
     * @param openByVerdict open alerts by verdict key (MATERIAL, UNCERTAIN, ...; "none" for a finding without one)
     * @param byState       alerts of current runs by state
     * @param lastSignOff   the latest sign-off of any wave, or null
     * @param lastWaveSignedOff whether {@code lastWave} has a sign-off
     */
    public record DatasetSummary(String dataset, String lastWave, Instant lastJudgedAt, int wavesJudged,
                                 Map<String, Integer> openByVerdict, Map<AlertState, Integer> byState,
                                 SignOff lastSignOff, boolean lastWaveSignedOff) {
        public DatasetSummary {
            openByVerdict = Map.copyOf(openByVerdict);
            byState = Map.copyOf(byState);
        }
    }

    /** Which findings a grid shows: null for any. */
    public record GridFilter(String kind, String verdict) {
        public static final GridFilter ANY = new GridFilter(null, null);
    }

    /**
     * One variable in one wave: the most urgent of its findings that pass the filter (MATERIAL before UNCERTAIN before
     * MINOR before STABLE, then a finding without a verdict), with how many findings it stands for.
     *
     * @param alertState the state of the alert on this variable in this wave, or null when none
     */
    public record GridCell(long findingId, String kind, String verdict, int findings, AlertState alertState) {
        /** No finding of this variable in this wave. */
        public static final GridCell EMPTY = new GridCell(0, null, null, 0, null);

        public boolean empty() {
            return findingId == 0;
        }
    }

    /** A variable's cells, one per wave of {@link Grid#waves()} in that order ({@link GridCell#EMPTY} for none). */
    public record GridRow(String variable, String label, List<GridCell> cells) {
        public GridRow {
            cells = List.copyOf(cells);
        }
    }

    /**
     * @param kinds every finding kind present in the dataset (for the filter's choices), in a stable order
     */
    public record Grid(String dataset, List<String> waves, List<GridRow> rows, List<String> kinds) {
        public Grid {
            waves = List.copyOf(waves);
            rows = List.copyOf(rows);
            kinds = List.copyOf(kinds);
        }
    }

    /**
     * The same variable and kind in one wave: the effect with its interval, and where the finding's detail has one,
     * the current wave's level (share, mean, median) with its interval.
     */
    public record TrendPoint(String wave, long findingId, String verdict, String effectName, Double estimate,
                             Double low, Double high, Double threshold, String levelName, Double level,
                             Double levelLow, Double levelHigh) {
    }

    /**
     * A finding page's data.
     *
     * @param alert   the alert the finding belongs to (its lead or one of its other findings), or null
     * @param history that alert's actions in order, empty when there is no alert
     * @param trend   the same variable and kind across every wave with a current run, in wave order
     */
    public record FindingView(long findingId, long runId, String dataset, String wave, String againstWave,
                              Finding finding, AlertView alert, List<ReviewEntry> history, List<TrendPoint> trend) {
        public FindingView {
            history = List.copyOf(history);
            trend = List.copyOf(trend);
        }
    }

    /**
     * A wave page's data.
     *
     * @param runId       the current run, or 0 when the wave has none
     * @param alerts      the alerts of the current run (all states)
     * @param signOffs    every sign-off of the wave, oldest first
     */
    public record WaveView(String dataset, String wave, String againstWave, long runId, Instant judgedAt,
                           String configFingerprint, String toolVersion, int findings, List<AlertView> alerts,
                           List<SignOff> signOffs) {
        public WaveView {
            alerts = List.copyOf(alerts);
            signOffs = List.copyOf(signOffs);
        }
    }

    /** A variable whose name or label matched, with its latest current finding. */
    public record SearchHit(String dataset, String variable, String label, String lastWave, long findingId,
                            String verdict) {
    }

    /** Every dataset with results, by name. */
    public List<DatasetSummary> datasets() {
        throw new UnsupportedOperationException("not yet");
    }

    /** The grid of {@code dataset}, waves ordered by {@code waveOrder}. */
    public Grid grid(String dataset, GridFilter filter, Comparator<String> waveOrder) {
        throw new UnsupportedOperationException("not yet");
    }

    public Optional<FindingView> finding(long findingId, Comparator<String> waveOrder) {
        throw new UnsupportedOperationException("not yet");
    }

    public Optional<WaveView> wave(String dataset, String wave) {
        throw new UnsupportedOperationException("not yet");
    }

    /** Variables whose name or label contains {@code text} (case-insensitive, as text, never a pattern). */
    public List<SearchHit> search(String text, int limit) {
        throw new UnsupportedOperationException("not yet");
    }
}
