package org.wavewarden.pipeline;

import org.jdbi.v3.core.Handle;
import org.wavewarden.compare.release.ReleaseComparison;
import org.wavewarden.compare.release.ReleaseComparison.ComparedColumn;
import org.wavewarden.compare.release.ReleaseRevision;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.deliver.Cautions;
import org.wavewarden.deliver.FindingsFiles;
import org.wavewarden.deliver.ReleaseDigest;
import org.wavewarden.deliver.ReleaseReport;
import org.wavewarden.deliver.ToolVersion;
import org.wavewarden.missing.ScreenedWave;
import org.wavewarden.missing.VariableInference;
import org.wavewarden.read.KeyedPairReader;
import org.wavewarden.read.ReleaseListing;
import org.wavewarden.read.SourceCatalog;
import org.wavewarden.read.SourceColumn;
import org.wavewarden.read.WaveInfo;
import org.wavewarden.read.WaveScanner;
import org.wavewarden.read.WaveSource;
import org.wavewarden.store.ReleaseComparisons;

import java.nio.file.Path;
import java.time.Clock;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.function.LongConsumer;
import java.util.stream.Collectors;

/**
 * Compares two publications of one wave: finds them (two values of the release column, or the previous table
 * beside the dataset's own), reads both in one statement matched by respondent key, and judges the two releases'
 * distributions exactly as two waves are judged. A release comparison is an audit of the publication, not a run of
 * the monitor: it makes no run, finding or alert, but it is kept in the results schema's {@code release_comparison}
 * (with the {@code releases.json} and {@code releases.md} written for it), so the console can show it.
 */
public final class ReleaseJudge {

    private final Session session;
    private final Clock clock;

    public ReleaseJudge(Session session, Clock clock) {
        this.session = session;
        this.clock = clock;
    }

    /** The two sides of the comparison and how to name them. */
    record Sides(String layout, WaveSource before, KeyedPairReader.Selection beforeSelection, WaveSource after,
                 KeyedPairReader.Selection afterSelection) {
    }

    /**
     * @param release        with a release column, the later release (default: the latest); else must be null
     * @param againstRelease with a release column, the earlier release (default: the one before {@code release})
     * @param outDir         where {@code releases.json} and {@code releases.md} go; null for none
     */
    public ReleaseReport compare(DatasetConfig d, String wave, String release, String againstRelease, Path outDir,
                                 LongConsumer progress) {
        WardenConfig cfg = session.config();
        int index = cfg.datasets().indexOf(d);
        String key = index < 0 ? "dataset" : "datasets[" + index + "]";
        if (d.releases() == null) {
            throw new ConfigException(key + ".releases", "missing: comparing releases needs respondentKey and"
                    + " releases: {column: ...} (a release column) or {previousTable: ...} (the earlier publication)");
        }
        WaveSource source = WaveSource.of(d, key);
        List<String> order = new WaveJudge(session, clock).waves(d).stream().map(WaveInfo::wave).toList();
        if (!order.contains(wave)) {
            throw new ConfigException("--wave", "no wave '" + wave + "' in " + d.name() + "; waves: " + order);
        }
        ReleaseReport report = session.source().withHandle(h -> {
            Sides sides = d.releases().inOneTable() ? releaseColumnSides(h, source, wave, release, againstRelease)
                    : previousTableSides(d, key, source, wave, release, againstRelease);
            return compare(h, d, key, wave, sides, progress);
        });
        // Every comparison is kept, with the very texts its files get, before the files are written: a stored row
        // without files is a comparison the console can still hand out; files without a row would be one it cannot.
        session.migrate();
        new ReleaseComparisons(session.store().jdbi(), cfg.results().schema()).save(report,
                ReleaseDigest.json(report), ReleaseDigest.markdown(report), ToolVersion.current());
        if (outDir != null) {
            ReleaseDigest.write(outDir, report);
        }
        return report;
    }

    private ReleaseReport compare(Handle h, DatasetConfig d, String key, String wave, Sides sides,
                                  LongConsumer progress) {
        WardenConfig cfg = session.config();
        List<SourceColumn> afterColumns = SourceCatalog.columns(h, sides.after().tableFor(wave));
        List<SourceColumn> beforeColumns = sides.before().tableFor(wave).equals(sides.after().tableFor(wave))
                ? afterColumns : SourceCatalog.columns(h, sides.before().tableFor(wave));
        requireKey(d, key, sides.after(), wave, afterColumns);
        requireKey(d, key, sides.before(), wave, beforeColumns);
        Map<String, SourceColumn> before = beforeColumns.stream()
                .collect(Collectors.toMap(SourceColumn::name, c -> c, (x, y) -> x, java.util.LinkedHashMap::new));
        Set<String> afterNames = afterColumns.stream().map(SourceColumn::name).collect(Collectors.toSet());
        List<ComparedColumn> compared = new ArrayList<>();
        List<String> added = new ArrayList<>();
        for (SourceColumn c : afterColumns) {
            // The weight's cells are compared (a reweighted release is a revision), its distribution is not.
            boolean weight = c.name().equals(d.weightColumn());
            if (d.isBookkeeping(c.name()) && !weight) {
                continue;
            }
            SourceColumn b = before.get(c.name());
            if (b == null) {
                added.add(c.name());
            } else {
                compared.add(new ComparedColumn(c.name(), b.type(), c.type(), !weight));
            }
        }
        List<String> dropped = beforeColumns.stream().map(SourceColumn::name)
                .filter(n -> !afterNames.contains(n) && (!d.isBookkeeping(n) || n.equals(d.weightColumn())))
                .toList();

        ReleaseComparison comparison = new ReleaseComparison(compared, sides.beforeSelection().label(),
                sides.afterSelection().label(), WaveScanner.DEFAULT_MAX_DISTINCT);
        KeyedPairReader.PairScan scan = KeyedPairReader.read(h, d.respondentKey(),
                compared.stream().map(ComparedColumn::name).toList(), sides.beforeSelection(),
                sides.afterSelection(), comparison, progress);
        String what = d.name() + " wave " + wave + " " + sides.afterSelection().label() + " against "
                + sides.beforeSelection().label();
        ReleaseRevision revision = comparison.finish(scan.before(), scan.after(), (b, a) -> {
            List<String> inference = new ArrayList<>();
            List<VariableConfig> variables = VariableInference.variables(d, a.values(), inference);
            // Releases are compared unweighted: a reweighted release is a revision of its weight cells.
            ScreenedWave later = ScreenedWave.screen(sides.afterSelection().label(), a, null, variables, inference);
            ScreenedWave earlier = ScreenedWave.screen(sides.beforeSelection().label(), b, null, variables, List.of());
            return new ReleaseRevision.Distributions(inference, FindingsFiles.ordered(
                    WaveJudge.judgeVariables(earlier, later, cfg.alpha(), cfg.fdr(), what, d.population())));
        });
        return new ReleaseReport(d.name(), wave, sides.layout(), sides.beforeSelection().label(),
                sides.afterSelection().label(), d.respondentKey(), clock.instant(), cfg.alpha(), cfg.fdr().name(),
                added, dropped, revision, Cautions.LINES);
    }

    /** Two values of the release column: the later (default the latest) and the one before it (or the given one). */
    private static Sides releaseColumnSides(Handle h, WaveSource source, String wave, String release,
                                            String against) {
        List<String> releases = ReleaseListing.releases(h, source, wave);
        String after = release == null ? (releases.isEmpty() ? null : releases.get(releases.size() - 1)) : release;
        if (after == null || !releases.contains(after)) {
            throw new ConfigException("--release", "no release '" + after + "' of wave " + wave + "; releases: "
                    + releases);
        }
        String before = against;
        if (before == null) {
            int i = releases.indexOf(after);
            if (i == 0) {
                throw new ConfigException(release == null ? "--wave" : "--release", "release " + after + " is the"
                        + " first of wave " + wave + " (releases: " + releases + "); there is no earlier one to"
                        + " compare it with");
            }
            before = releases.get(i - 1);
        } else if (!releases.contains(before) || before.equals(after)) {
            throw new ConfigException("--against", "expected another release of wave " + wave + " but got '" + before
                    + "'; releases: " + releases);
        }
        return new Sides("release column " + source.releaseColumn(), source,
                new KeyedPairReader.Selection("release " + before, source.fromClause(wave, before)), source,
                new KeyedPairReader.Selection("release " + after, source.fromClause(wave, after)));
    }

    /** The previous table's rows of the wave against the dataset's own table. */
    private static Sides previousTableSides(DatasetConfig d, String key, WaveSource source, String wave,
                                            String release, String against) {
        if (release != null || against != null) {
            throw new ConfigException(release != null ? "--release" : "--against", "only for releases kept in a"
                    + " release column; " + d.name() + " keeps its earlier publication in "
                    + d.releases().previousTable());
        }
        WaveSource previous = WaveSource.previousPublication(d, key);
        return new Sides("previous table", previous, new KeyedPairReader.Selection("previous table "
                + previous.tableFor(wave), previous.fromClause(wave)), source,
                new KeyedPairReader.Selection("table " + source.tableFor(wave), source.fromClause(wave)));
    }

    private static void requireKey(DatasetConfig d, String key, WaveSource side, String wave,
                                   List<SourceColumn> columns) {
        if (columns.isEmpty()) {
            throw new ConfigException(key + ".releases", "table " + side.tableFor(wave) + " does not exist in the"
                    + " source database (or this role cannot see it)");
        }
        if (columns.stream().noneMatch(c -> c.name().equals(d.respondentKey()))) {
            throw new ConfigException(key + ".respondentKey", "column " + d.respondentKey() + " does not exist in "
                    + side.tableFor(wave) + "; it has " + CatalogCheck.names(columns));
        }
    }
}
