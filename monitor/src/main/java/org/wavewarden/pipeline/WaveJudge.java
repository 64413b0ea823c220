package org.wavewarden.pipeline;

import org.jdbi.v3.core.Handle;
import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.VariableComparator;
import org.wavewarden.compare.VariableComparisons;
import org.wavewarden.compare.LocationHistory;
import org.wavewarden.compare.location.LocationTestChoice;
import org.wavewarden.compare.WeightedComparator;
import org.wavewarden.compare.WeightedComparisons;
import org.wavewarden.compare.panel.PanelComparisons;
import org.wavewarden.compare.panel.PairedPanel;
import org.wavewarden.compare.relation.RelationshipFindings;
import org.wavewarden.config.CompareWith;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.Population;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.deliver.Alert;
import org.wavewarden.deliver.Alerts;
import org.wavewarden.deliver.FindingsFiles;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.judge.Against;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.WhereItChanged;
import org.wavewarden.compare.interviewer.InterviewerMonitor;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.SchemaFindings;
import org.wavewarden.judge.WaveVerdicts;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.profile.SchemaChanges;
import org.wavewarden.profile.DesignSummary;
import org.wavewarden.profile.WaveProfile;
import org.wavewarden.read.BinaryWaveScanner;
import org.wavewarden.read.PairSpec;
import org.wavewarden.read.SourceCatalog;
import org.wavewarden.read.SourceColumn;
import org.wavewarden.read.WaveInfo;
import org.wavewarden.read.WaveListing;
import org.wavewarden.read.WaveScanner;
import org.wavewarden.read.WaveSource;
import org.wavewarden.store.OutboxStore;
import org.wavewarden.store.ResultsStore;
import org.wavewarden.store.AlertReviews;
import org.wavewarden.store.SignOffs;
import org.wavewarden.review.CreationRules;
import org.wavewarden.review.SignOff;
import org.wavewarden.review.SignOffDrift;
import org.wavewarden.judge.Repeats;
import org.wavewarden.store.WaveCodebooks;
import org.wavewarden.codebook.CodebookMerge;
import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.missing.ScreenedWave;
import org.wavewarden.missing.VariableInference;
import org.wavewarden.missing.ScreenedVariable;
import org.wavewarden.missing.DataQualityFindings;

import java.time.Clock;
import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.function.LongConsumer;

/**
 * Judges one wave of one dataset: read, profile, screen for disguised missing values, compare, judge, and write
 * the run in one transaction. Earlier waves come from their stored summaries; only a wave never summarised before
 * is read from the source.
 */
public final class WaveJudge {

    private static final org.slf4j.Logger LOG = org.slf4j.LoggerFactory.getLogger(WaveJudge.class);
    /** The subject of findings about a whole wave rather than one variable. */
    public static final String EMPTY_WAVE_SUBJECT = "(wave)";

    private final Session session;
    private final Clock clock;
    /** The version of the tool the runs are recorded as judged by: part of a run's key. */
    private final String toolVersion;
    private Scanner scanner;
    private PanelPairs.Reader pairReader = org.wavewarden.read.KeyedPairReader::read;

    public WaveJudge(Session session, Clock clock) {
        this(session, clock, org.wavewarden.deliver.ToolVersion.current());
    }

    /**
     * The same, recording the runs as judged by {@code toolVersion} rather than the running build's version: a rerun
     * of stored data by another version is another run.
     */
    public WaveJudge(Session session, Clock clock, String toolVersion) {
        this.session = session;
        this.clock = clock;
        this.toolVersion = toolVersion;
        this.scanner = new BinaryWaveScanner(WaveScanner.DEFAULT_MAX_DISTINCT)::scan;
    }

    /**
     * Reads one wave's monitored columns (and the weight column, if any) into tallies in one pass, with the joint
     * tallies of the configured pairs; {@link BinaryWaveScanner#scan} is the one (tests count or check its passes
     * through this seam).
     */
    @FunctionalInterface
    public interface Scanner {
        /** The scan with the domains of the dataset's breakdown columns tallied in the same pass. */
        WaveScanner.WaveScan scan(Handle h, WaveSource source, String wave, List<SourceColumn> columns,
                                  SourceColumn weight, WaveScanner.Design design, List<PairSpec> pairs,
                                  WaveScanner.Domains domains, LongConsumer progress);

        /** The scan without breakdowns. */
        default WaveScanner.WaveScan scan(Handle h, WaveSource source, String wave, List<SourceColumn> columns,
                                          SourceColumn weight, WaveScanner.Design design, List<PairSpec> pairs,
                                          LongConsumer progress) {
            return scan(h, source, wave, columns, weight, design, pairs, WaveScanner.Domains.NONE, progress);
        }
    }

    /** Reads waves with the given scanner from now on; returns this judge. */
    public WaveJudge useScanner(Scanner scanner) {
        this.scanner = java.util.Objects.requireNonNull(scanner, "scanner");
        return this;
    }

    /** Reads a panel's pairs with the given reader from now on; returns this judge. */
    public WaveJudge usePairReader(PanelPairs.Reader reader) {
        this.pairReader = java.util.Objects.requireNonNull(reader, "reader");
        return this;
    }

    /** Waves of a dataset in wave order. */
    public List<WaveInfo> waves(DatasetConfig d) {
        return session.source().withHandle(h -> WaveListing.list(h, WaveSource.of(d, "dataset"), d.waveOrder()));
    }

    /**
     * The same with the waves' row counts: under the previous-wave and pooled rules a wave without rows is never a
     * baseline, and the last waves with rows stand in (a configured baseline or {@code --against} is taken as
     * given; a wave {@code k} back without rows is no baseline). With several rules, the run's main baseline: the
     * first rule's, or when it has none for this wave (no wave {@code k} back yet), the next rule's that has one.
     */
    public static List<String> baselinesWithRows(DatasetConfig d, List<WaveInfo> waves, String wave, String override) {
        if (override != null) {
            return baselineWaves(d, waves.stream().map(WaveInfo::wave).toList(), wave, override);
        }
        return ruleBaselines(d, waves, wave).get(0).waves();
    }

    /** One rule of a run and the waves it compares the judged wave with this time (empty: none). */
    public record RuleWaves(CompareWith rule, List<String> waves) {
    }

    /**
     * Every rule of the dataset with its waves, the run's main rule first (the first rule with a baseline for this
     * wave, else the first rule), the others in their configured order.
     */
    public static List<RuleWaves> ruleBaselines(DatasetConfig d, List<WaveInfo> waves, String wave) {
        List<String> order = waves.stream().map(WaveInfo::wave).toList();
        if (!order.contains(wave)) {
            throw new ConfigException("--wave", "no wave '" + wave + "' in " + d.name() + "; waves: " + order);
        }
        List<RuleWaves> all = d.compareWith().rules().stream()
                .map(r -> new RuleWaves(r, withRows(r, d, waves, wave))).toList();
        int main = 0;
        while (main < all.size() && all.get(main).waves().isEmpty()) {
            main++;
        }
        if (main == all.size() || main == 0) {
            return all;
        }
        List<RuleWaves> out = new ArrayList<>(all.size());
        out.add(all.get(main));
        for (int i = 0; i < all.size(); i++) {
            if (i != main) {
                out.add(all.get(i));
            }
        }
        return out;
    }

    private static List<String> withRows(CompareWith rule, DatasetConfig d, List<WaveInfo> waves, String wave) {
        List<String> order = waves.stream().map(WaveInfo::wave).toList();
        List<String> asListed = baselineWaves(rule, d, order, wave);
        if (rule instanceof CompareWith.Baseline) {
            return asListed;
        }
        java.util.Set<String> empty = new java.util.HashSet<>();
        waves.stream().filter(w -> w.rows() == 0).forEach(w -> empty.add(w.wave()));
        if (rule instanceof CompareWith.SameWaveBack) {
            // The season's wave and no other: a nearer wave with rows would compare another season.
            return asListed.stream().filter(w -> !empty.contains(w)).toList();
        }
        List<String> earlier = order.subList(0, order.indexOf(wave)).stream().filter(w -> !empty.contains(w)).toList();
        int take = rule instanceof CompareWith.PooledLast p ? p.waves() : 1;
        return earlier.subList(Math.max(0, earlier.size() - take), earlier.size());
    }

    /** The waves without rows the main rule passed over to reach {@code chosen}. */
    private static List<String> passedOver(DatasetConfig d, CompareWith rule, List<WaveInfo> waves, String wave,
                                           String override, List<String> chosen) {
        if (override == null && !(rule instanceof CompareWith.Previous || rule instanceof CompareWith.PooledLast)) {
            return List.of();
        }
        List<String> order = waves.stream().map(WaveInfo::wave).toList();
        List<String> asListed = override != null ? baselineWaves(d, order, wave, override)
                : baselineWaves(rule, d, order, wave);
        if (asListed.equals(chosen)) {
            return List.of();
        }
        int from = chosen.isEmpty() ? 0 : order.indexOf(chosen.get(0));
        int to = order.indexOf(wave);
        return waves.subList(from, to).stream().filter(w -> w.rows() == 0).map(WaveInfo::wave).toList();
    }

    /** The waves the given wave is compared against under the dataset's first rule (empty for the first wave). */
    public static List<String> baselineWaves(DatasetConfig d, List<String> order, String wave, String override) {
        int i = order.indexOf(wave);
        if (i < 0) {
            throw new ConfigException("--wave", "no wave '" + wave + "' in " + d.name() + "; waves: " + order);
        }
        if (override != null) {
            if (!order.contains(override) || override.equals(wave)) {
                throw new ConfigException("--against", "expected another wave of " + d.name() + " but got '"
                        + override + "'; waves: " + order);
            }
            return List.of(override);
        }
        return baselineWaves(d.compareWith().rules().get(0), d, order, wave);
    }

    /** The waves one rule compares the given wave against, rows not considered (empty: none). */
    public static List<String> baselineWaves(CompareWith cw, DatasetConfig d, List<String> order, String wave) {
        int i = order.indexOf(wave);
        if (i < 0) {
            throw new ConfigException("--wave", "no wave '" + wave + "' in " + d.name() + "; waves: " + order);
        }
        if (cw instanceof CompareWith.Baseline b) {
            if (!order.contains(b.wave())) {
                throw new ConfigException("compareWith.baseline", "no wave '" + b.wave() + "' in " + d.name());
            }
            return b.wave().equals(wave) ? List.of() : List.of(b.wave());
        }
        if (cw instanceof CompareWith.PooledLast p) {
            return order.subList(Math.max(0, i - p.waves()), i);
        }
        if (cw instanceof CompareWith.SameWaveBack s) {
            return i >= s.waves() ? List.of(order.get(i - s.waves())) : List.of();
        }
        return i == 0 ? List.of() : List.of(order.get(i - 1));
    }

    /**
     * Judges a wave and writes its findings files into {@code outDir} (null for none) before returning: the files
     * are an outbox row of the run, carried out at once from the stored results.
     */
    public JudgedWave judge(DatasetConfig d, String wave, String againstOverride, java.nio.file.Path outDir,
                            LongConsumer progress) {
        JudgedWave j = judgeWithOutputs(d, wave, againstOverride, outDir == null ? OutboxStore.Outputs.NONE
                : OutboxStore.Outputs.files(outDir), progress);
        if (outDir != null) {
            java.nio.file.Path folder = outDir.toAbsolutePath().normalize();
            session.store().outbox().pendingWaveFiles(j.runId()).stream().filter(row -> row.folder().equals(folder))
                    .forEach(row -> FindingsFiles.carryOut(session.store(), row));
        }
        return j;
    }

    /** Judges a wave and commits the run with its outputs as outbox rows, which the caller carries out. */
    public JudgedWave judgeWithOutputs(DatasetConfig d, String wave, String againstOverride,
                                       OutboxStore.Outputs outputs, LongConsumer progress) {
        Instant started = clock.instant();
        WardenConfig cfg = session.config();
        WaveSource source = WaveSource.of(d, "dataset");
        List<WaveInfo> listed = waves(d);
        List<String> order = listed.stream().map(WaveInfo::wave).toList();
        // --against names the one wave to compare with, instead of every configured rule.
        List<RuleWaves> rules = againstOverride != null ? List.of(new RuleWaves(d.compareWith().rules().get(0),
                baselinesWithRows(d, listed, wave, againstOverride))) : ruleBaselines(d, listed, wave);
        List<String> against = rules.get(0).waves();
        String mainLabel = against.isEmpty() ? null : Against.waves(against);

        WaveProfile current = session.source().withHandle(h -> profile(h, d, source, wave, progress));
        List<WaveProfile> baselines = new ArrayList<>();
        List<String> notes = new ArrayList<>();
        List<String> passedOver = passedOver(d, rules.get(0).rule(), listed, wave, againstOverride, against);
        if (!passedOver.isEmpty()) {
            notes.add("Wave" + (passedOver.size() == 1 ? " " : "s ") + String.join(", ", passedOver)
                    + (passedOver.size() == 1 ? " has" : " have") + " no rows and " + (passedOver.size() == 1 ? "is"
                    : "are") + " never a baseline: wave " + wave + " is compared against " + (against.isEmpty()
                    ? "nothing" : String.join(", ", against)) + ", the last wave" + (against.size() > 1 ? "s" : "")
                    + " with rows.");
        }
        for (String b : against) {
            baselines.add(baselineProfile(d, source, b, current.columnNames(), notes));
        }
        WaveProfile baseline = baselines.isEmpty() ? null
                : baselines.size() == 1 ? baselines.get(0) : WaveProfile.pooled(mainLabel, baselines);
        List<FurtherBaseline> further = furtherBaselines(d, source, rules, wave, current, notes);
        String againstLabel = Against.runLabel(mainLabel, further.stream().map(FurtherBaseline::label).toList());

        WaveCodebooks codebooks = new WaveCodebooks(session.store().jdbi(), cfg.results().schema());
        Optional<DatasetCodebook> currentCodebook = codebooks.load(d.name(), wave);
        // A pooled baseline is read against the codebook of its latest wave, the one nearest the judged wave.
        String codebookBaseline = against.isEmpty() ? null : against.get(against.size() - 1);
        Optional<DatasetCodebook> baselineCodebook = codebookBaseline == null ? Optional.empty()
                : codebooks.load(d.name(), codebookBaseline);
        DatasetConfig judgedAs = withWaveCodebook(d, currentCodebook, notes);
        Screened screened = screen(judgedAs, current, baseline);
        Profiled judged = findings(cfg, judgedAs, current, baseline, screened,
                panel(judgedAs, source, against, baseline, current, screened),
                history(d, source, listed, wave, against, baselines, mainLabel), further);
        List<String> inference = new ArrayList<>(notes);
        inference.addAll(judged.inference());
        List<Finding> findings = labelled(screened, FindingsFiles.ordered(withRelabelledCodes(judged.findings(),
                screened, baselineCodebook, currentCodebook, codebookBaseline, wave)));
        String fingerprint = org.wavewarden.config.ConfigFingerprint.of(cfg, d);
        String checksum = current.checksum();
        Optional<Long> kept = session.store().sameRun(d.name(), wave, againstLabel == null ? "" : againstLabel,
                checksum, fingerprint, toolVersion);
        findings = marked(d, wave, against, findings, kept);
        CaseListing.Wanted cases = CaseListing.wanted(judgedAs, findings, screened.current(), inference);
        List<Alert> alerts = Alerts.group(findings);
        Instant finished = clock.instant();
        FindingsReport report = new FindingsReport(d.name(), wave, againstLabel, finished, cfg.alpha(),
                cfg.fdr().name(), inference, findings, toolVersion, fingerprint);
        // A kept run's lists are stored already: the wave is not read again for them.
        List<org.wavewarden.store.CaseLists.Draft> caseLists = kept.isPresent() ? List.of()
                : CaseListing.read(session.source(), judgedAs, source, wave, cases);
        FaultPoints.hit(FaultPoints.BEFORE_WRITE);
        long runId = session.store().writeRun(new ResultsStore.RunWrite(d.name(), wave,
                        againstLabel == null ? "" : againstLabel, checksum, started, finished, cfg.alpha(),
                        cfg.fdr().name(), report.toolVersion(), fingerprint),
                current, findings, alerts, inference, outputs, CreationRules.decider(d, order, wave,
                        java.time.LocalDate.ofInstant(finished, java.time.ZoneOffset.UTC),
                        reviews().activeMutes(d.name(), java.time.LocalDate.ofInstant(finished,
                                java.time.ZoneOffset.UTC))), caseLists);
        // The summary the run stored becomes the baseline of later waves under this configuration.
        session.store().keySummary(d.name(), wave, checksum, SummaryKey.of(d, current.schema()).value());
        return new JudgedWave(report, runId, alerts);
    }

    /**
     * The baselines of the run's rules after the main one, each read once (a stored summary when there is one), and
     * a note for every rule that has no baseline for this wave or only the waves of a rule before it.
     */
    private List<FurtherBaseline> furtherBaselines(DatasetConfig d, WaveSource source, List<RuleWaves> rules,
                                                   String wave, WaveProfile current, List<String> notes) {
        List<FurtherBaseline> out = new ArrayList<>();
        java.util.Set<List<String>> compared = new java.util.HashSet<>();
        compared.add(rules.get(0).waves());
        boolean several = rules.size() > 1;
        for (int i = 0; i < rules.size(); i++) {
            RuleWaves r = rules.get(i);
            if (r.waves().isEmpty()) {
                if (several || r.rule() instanceof CompareWith.SameWaveBack) {
                    notes.add("Wave " + wave + " has no baseline " + Against.ruleName(r.rule()) + " (no earlier wave"
                            + " with rows that far back), so it is judged " + (rules.get(0).waves().isEmpty()
                            ? "against no baseline: screened, not compared." : "against " + Against.waves(
                            rules.get(0).waves()) + " (" + Against.ruleName(rules.get(0).rule()) + ")"
                            + (several ? " and the other rules' baselines" : "") + " only."));
                }
                continue;
            }
            if (i == 0) {
                continue;
            }
            if (!compared.add(r.waves())) {
                notes.add("The baseline " + Against.ruleName(r.rule()) + " of wave " + wave + " is "
                        + Against.waves(r.waves()) + ", already compared under another rule, so it is compared"
                        + " once.");
                continue;
            }
            String label = Against.label(r.waves(), r.rule());
            List<WaveProfile> profiles = new ArrayList<>();
            for (String b : r.waves()) {
                profiles.add(baselineProfile(d, source, b, current.columnNames(), notes));
            }
            out.add(new FurtherBaseline(label, profiles.size() == 1 ? profiles.get(0)
                    : WaveProfile.pooled(Against.waves(r.waves()), profiles)));
        }
        return out;
    }

    private AlertReviews reviews() {
        return new AlertReviews(session.store().jdbi(), session.config().results().schema());
    }

    /**
     * The run's findings with what earlier records say about them: repeats of the previous wave's findings marked
     * (they raise no new alert), and, when the wave was signed off on other findings, a SIGNED_WAVE_CHANGED finding.
     *
     * <p>A run the store keeps ({@code kept}: the same data, configuration and tool version as a stored run) writes
     * no findings, so it is compared with no sign-off: it carries the drift finding its stored run was written with,
     * if any, which keeps that finding's alert open, and adds none that would never be stored.
     */
    private List<Finding> marked(DatasetConfig d, String wave, List<String> against, List<Finding> findings,
                                 Optional<Long> kept) {
        String previousWave = against.size() == 1 ? against.get(0) : null;
        List<Finding> out = new ArrayList<>(Repeats.mark(previousWave, previousWave == null ? List.of()
                : currentFindings(d.name(), previousWave), findings));
        if (kept.isPresent()) {
            session.store().storedReport(kept.get()).map(FindingsReport::findings).orElse(List.of()).stream()
                    .filter(f -> f.kind() == FindingKind.SIGNED_WAVE_CHANGED).forEach(out::add);
            return out;
        }
        Optional<SignOff> signed = new SignOffs(session.store().jdbi(), session.config().results().schema())
                .latest(d.name(), wave);
        signed.flatMap(so -> SignOffDrift.check(so, session.store().storedReport(so.runId())
                .map(FindingsReport::findings).orElse(List.of()), out)).ifPresent(changed -> {
                    LOG.error("dataset {}: {}", d.name(), changed.sentence());
                    out.add(changed);
                });
        return out;
    }

    /** The findings of a wave's current run, or none. */
    private List<Finding> currentFindings(String dataset, String wave) {
        return session.store().currentRun(dataset, wave).flatMap(r -> session.store().storedReport(r.runId()))
                .map(FindingsReport::findings).orElse(List.of());
    }

    /**
     * The dataset as the wave is judged: the YAML's variables (already merged with the dataset's codebook) first,
     * the wave's own codebook, read from the results schema, under them, giving labels, declared missing values and
     * kinds to columns the YAML does not list. Without a codebook of the wave's own the dataset is as configured.
     * Readers after the run (the HTML digest) call this to see the wave as the run saw it.
     */
    public static DatasetConfig withWaveCodebook(Session session, DatasetConfig d, String wave) {
        return withWaveCodebook(d, new WaveCodebooks(session.store().jdbi(), session.config().results().schema())
                .load(d.name(), wave), new ArrayList<>());
    }

    /** The same with the wave's codebook already read (empty: none); the merge is noted in {@code notes}. */
    static DatasetConfig withWaveCodebook(DatasetConfig d, Optional<DatasetCodebook> codebook, List<String> notes) {
        if (codebook.isEmpty()) {
            return d;
        }
        CodebookMerge.Merged merged = CodebookMerge.merge(d.variables(), codebook.get());
        merged.report().forEach(line -> LOG.info("dataset {}: {}", d.name(), line));
        notes.add("The codebook the wave was imported with was merged under the configured variables: " + merged.variables().size() + " variables with their labels and declared missing"
                + " values; the configuration wins where both say something.");
        return new DatasetConfig(d.name(), d.table(), d.waveColumn(), d.tablePattern(), d.waveOrder(),
                d.compareWith(), d.schedule(), d.exclude(), merged.variables(), d.quietPeriod(), d.alerts(),
                d.readyTable(), d.readyColumn(), d.weightColumn(), d.respondentKey(), d.releases(), d.design(),
                d.relationships(), null, d.population(), d.alertRules(), d.breakdowns());
    }

    /**
     * The findings with a LABEL_CHANGED finding for every variable whose codes are labelled otherwise in the current
     * wave's codebook than in the baseline wave's; only two codebooks of the waves' own can show this.
     */
    static List<Finding> withRelabelledCodes(List<Finding> findings, Screened screened,
                                             Optional<DatasetCodebook> baseline, Optional<DatasetCodebook> current,
                                             String baselineWave, String currentWave) {
        if (baseline.isEmpty() || current.isEmpty()) {
            return findings;
        }
        List<Finding> out = new ArrayList<>(findings);
        for (VariableConfig v : screened.current().variables()) {
            Optional<org.wavewarden.codebook.VariableMeta> before = baseline.get().variable(v.name());
            Optional<org.wavewarden.codebook.VariableMeta> after = current.get().variable(v.name());
            Optional<ScreenedVariable> sc = screened.current().get(v.name());
            if (before.isEmpty() || after.isEmpty() || sc.isEmpty()) {
                continue;
            }
            ScreenedVariable sb = screened.baseline() == null ? null : screened.baseline().get(v.name()).orElse(null);
            Finding f = DataQualityFindings.relabelledCodes(v, sb, sc.get(), before.get().valueLabels(),
                    after.get().valueLabels(), baselineWave, currentWave);
            if (f != null) {
                out.add(f);
            }
        }
        return out;
    }

    /** Every finding with the label of the variable it is about, as the wave was judged with it. */
    static List<Finding> labelled(Screened screened, List<Finding> findings) {
        Map<String, String> labels = new java.util.HashMap<>();
        screened.current().variables().forEach(v -> {
            if (v.label() != null && !v.label().isBlank()) {
                labels.put(v.name(), v.label());
            }
        });
        return findings.stream().map(f -> labels.containsKey(f.variable()) ? f.withLabel(labels.get(f.variable()))
                : f).toList();
    }

    /**
     * The findings of a wave and the notes on variables whose kind was inferred and on paired comparisons not made,
     * in report order.
     */
    public record Profiled(List<Finding> findings, List<String> inference) {
    }

    /**
     * Both waves of a check screened once for the whole run: the judged wave's variables (declared and inferred),
     * and the baseline screened as the same variables; {@code baseline} is null for a first wave.
     */
    public record Screened(ScreenedWave current, ScreenedWave baseline) {
    }

    /**
     * The missing-values stage of a check: each wave's summary screened once, weighted when the dataset has a weight
     * column. Every later stage of the run takes its answers from the result.
     */
    public static Screened screen(DatasetConfig d, WaveProfile current, WaveProfile baseline) {
        List<String> inference = new ArrayList<>();
        List<VariableConfig> variables = VariableInference.variables(d, current.columns().values(), inference);
        boolean weighted = d.weightColumn() != null;
        return new Screened(ScreenedWave.screen(current, weighted, variables, inference),
                baseline == null ? null : ScreenedWave.screen(baseline, weighted, variables, List.of()));
    }

    /**
     * Everything a check concludes from two wave summaries, without the database: screening, comparisons, the
     * false-discovery-rate control and the verdicts. {@code baseline} is null for a first wave.
     */
    public static Profiled findings(WardenConfig cfg, DatasetConfig d, WaveProfile current, WaveProfile baseline) {
        return findings(cfg, d, current, baseline, screen(d, current, baseline), null);
    }

    /**
     * The same from the run's screened waves, with the paired comparisons of a panel ({@link PanelComparisons}) in
     * the same false-discovery-rate family; {@code panel} is null when the wave is not compared paired. Why a
     * variable or the whole panel was not compared paired is added to the notes.
     */
    public static Profiled findings(WardenConfig cfg, DatasetConfig d, WaveProfile current, WaveProfile baseline,
                                    Screened screened, PairedPanel.Panel panel) {
        return findings(cfg, d, current, baseline, screened, panel, null);
    }

    /**
     * The same, with the dataset's first waves from which continuous variables' location tests are chosen (null:
     * each comparison chooses from its two waves).
     */
    public static Profiled findings(WardenConfig cfg, DatasetConfig d, WaveProfile current, WaveProfile baseline,
                                    Screened screened, PairedPanel.Panel panel, LocationHistory history) {
        return findings(cfg, d, current, baseline, screened, panel, history, List.of());
    }

    /**
     * A baseline judged alongside the run's main one ({@code compareWith} a list of rules): its name, which every
     * finding made against it carries ({@link Finding#withAgainst}), and its summary (pooled when the rule pools).
     */
    public record FurtherBaseline(String label, WaveProfile profile) {
    }

    /**
     * The same with further baselines judged alongside the main one: each adds the comparisons of the two waves
     * ({@link Collected#alongside}), named by the baseline, and every comparison of the run, against whichever
     * baseline, is one false-discovery-rate family.
     */
    public static Profiled findings(WardenConfig cfg, DatasetConfig d, WaveProfile current, WaveProfile baseline,
                                    Screened screened, PairedPanel.Panel panel, LocationHistory history,
                                    List<FurtherBaseline> further) {
        List<String> inference = new ArrayList<>(screened.current().inference());
        List<VariableConfig> variables = screened.current().variables();
        boolean weighted = d.weightColumn() != null;
        List<Comparison> relations = new ArrayList<>();
        List<Finding> relationNotes = new ArrayList<>();
        relationships(cfg, d, screened, current, baseline, relations, relationNotes);
        if (panel != null) {
            PanelComparisons.Result r = PanelComparisons.compare(panel, variables, 1 - cfg.alpha());
            relations.addAll(r.comparisons());
            inference.addAll(r.notes());
        }
        String what = d.name() + " wave " + current.wave();
        List<Collected> sides = new ArrayList<>();
        Map<String, WhereItChanged.Side> furtherSides = new LinkedHashMap<>();
        sides.add(collect(screened.baseline(), screened.current(), weighted && baseline != null ? baseline.design()
                : null, weighted ? current.design() : null, cfg.alpha(), what, relations, history));
        for (FurtherBaseline fb : further) {
            Screened other = new Screened(screened.current(), ScreenedWave.screen(fb.profile(), weighted, variables,
                    List.of()));
            furtherSides.put(fb.label(), new WhereItChanged.Side(fb.profile(), other.baseline()));
            List<Comparison> otherRelations = new ArrayList<>();
            relationships(cfg, d, other, current, fb.profile(), otherRelations, new ArrayList<>());
            sides.add(collect(other.baseline(), other.current(), weighted ? fb.profile().design() : null,
                    weighted ? current.design() : null, cfg.alpha(), what + " against " + fb.label(),
                    otherRelations, history).alongside());
        }
        List<List<Finding>> judged = WaveVerdicts.judgeAlongside(sides.stream().map(Collected::comparisons).toList(),
                sides.stream().map(Collected::summarised).toList(), cfg.alpha(), cfg.fdr(), d.population());
        List<Finding> findings = new ArrayList<>();
        for (int i = 0; i < sides.size(); i++) {
            List<Finding> side = new ArrayList<>(judged.get(i));
            side.addAll(sides.get(i).plain());
            String label = i == 0 ? null : further.get(i - 1).label();
            // The sentence says it too, as an alert's message carries the sentence and not the field.
            side.forEach(f -> findings.add(label == null ? f : f.withAgainst(label).withSentence(
                    Character.toUpperCase(Against.phrase(label).charAt(0)) + Against.phrase(label).substring(1)
                            + ": " + f.sentence())));
        }
        findings.addAll(relationNotes);
        findings.addAll(SchemaFindings.of(SchemaChanges.between(baseline, current)));
        if (current.rows() == 0) {
            findings.add(Finding.dataQuality(EMPTY_WAVE_SUBJECT, FindingKind.EMPTY_WAVE, null, 0L, "Wave "
                    + current.wave() + " of " + d.name() + " has no rows: nothing can be judged in it, and later"
                    + " waves are compared against the last wave with rows.", null));
        }
        WhereItChanged.Result where = WhereItChanged.attach(findings, baseline, current, screened.baseline(),
                screened.current(), furtherSides, d.breakdowns(), weighted, cfg.alpha(),
                org.wavewarden.compare.domain.Breakdowns::of);
        List<Finding> located = new ArrayList<>(where.findings());
        inference.addAll(where.notes());
        if (d.breakdowns().interviewer() != null) {
            InterviewerMonitor.Result interviewers = InterviewerMonitor.judge(current, screened.current(),
                    d.breakdowns(), cfg.alpha());
            located.addAll(interviewers.findings());
            inference.addAll(interviewers.notes());
        }
        return new Profiled(labelled(screened, FindingsFiles.ordered(located)), inference);
    }

    /**
     * Every variable's comparisons and data-quality findings between two screened sides, judged together: one
     * false-discovery-rate family, the verdict rule, one missing-rate finding per variable, shape findings only
     * where they add something ({@link WaveVerdicts}). A variable that cannot be analysed gets a SKIPPED finding
     * instead. Public so that two sides that are not two waves' summaries (two releases of one wave) are judged
     * exactly as waves are.
     *
     * @param baseline the baseline side, or null when there is nothing to compare with
     * @param what     names the comparison in the log, e.g. {@code labour wave 2025-Q1}
     */
    public static List<Finding> judgeVariables(ScreenedWave baseline, ScreenedWave current, double alpha,
                                               WardenConfig.FdrMethod fdr, String what) {
        return judgeVariables(baseline, current, null, null, alpha, fdr, what, List.of());
    }

    /** The same for two sides of a dataset observing {@code population} (a complete enumeration is judged by size). */
    public static List<Finding> judgeVariables(ScreenedWave baseline, ScreenedWave current, double alpha,
                                               WardenConfig.FdrMethod fdr, String what, Population population) {
        return judgeVariables(baseline, current, null, null, alpha, fdr, what, List.of(), null, population);
    }

    /**
     * The same with both sides' sampling designs (PSU sums; null for none), whose weighted comparisons then take
     * their variances from the strata and clusters, and with comparisons made elsewhere (the relationships of
     * configured pairs, a panel's paired comparisons) judged in the same false-discovery-rate family.
     */
    public static List<Finding> judgeVariables(ScreenedWave baseline, ScreenedWave current,
                                               DesignSummary baselineDesign, DesignSummary currentDesign,
                                               double alpha, WardenConfig.FdrMethod fdr, String what,
                                               List<Comparison> alsoJudged) {
        return judgeVariables(baseline, current, baselineDesign, currentDesign, alpha, fdr, what, alsoJudged, null);
    }

    /** The same, with the first waves of the series that continuous variables' location tests are chosen from. */
    public static List<Finding> judgeVariables(ScreenedWave baseline, ScreenedWave current,
                                               DesignSummary baselineDesign, DesignSummary currentDesign,
                                               double alpha, WardenConfig.FdrMethod fdr, String what,
                                               List<Comparison> alsoJudged, LocationHistory history) {
        return judgeVariables(baseline, current, baselineDesign, currentDesign, alpha, fdr, what, alsoJudged, history,
                Population.SAMPLE);
    }

    /**
     * The same for a dataset observing {@code population}: a census or a full register is judged by the size of
     * each change alone, with no test and no false-discovery-rate family ({@link org.wavewarden.judge.Judge}).
     */
    public static List<Finding> judgeVariables(ScreenedWave baseline, ScreenedWave current,
                                               DesignSummary baselineDesign, DesignSummary currentDesign,
                                               double alpha, WardenConfig.FdrMethod fdr, String what,
                                               List<Comparison> alsoJudged, LocationHistory history,
                                               Population population) {
        Collected c = collect(baseline, current, baselineDesign, currentDesign, alpha, what, alsoJudged, history);
        List<Finding> findings = new ArrayList<>(WaveVerdicts.judge(c.comparisons(), c.summarised(), alpha, fdr,
                population == null ? Population.SAMPLE : population));
        findings.addAll(c.plain());
        return findings;
    }

    /**
     * What one pair of sides gives before the false-discovery-rate control: the comparisons of the family, the
     * findings made without a test, and the relative error bound of each summarised variable.
     */
    record Collected(List<Comparison> comparisons, List<Finding> plain, Map<String, Double> summarised) {

        /**
         * What a further baseline adds to a run: only what compares the two waves (shifts, shapes, missing-rate
         * changes, relationships; codes that appeared or vanished, heaping or digit preference that rose; a
         * variable that could not be compared with that baseline). What the judged wave shows on its own (its
         * sentinels, codes, ranges, states, its comparison with a reference) is the same against every baseline
         * and is reported once, with the main baseline's findings; so are the panel's paired comparisons (pairs
         * are read with the main baseline only), schema changes and relabelled codes (the table's and codebook's
         * history, reported when they happened).
         */
        Collected alongside() {
            return new Collected(comparisons.stream().filter(c -> ALONGSIDE_KINDS.contains(c.kind())).toList(),
                    plain.stream().filter(f -> ALONGSIDE_KINDS.contains(f.kind())).toList(), summarised);
        }
    }

    /** The kinds a further baseline repeats, see {@link Collected#alongside}. */
    static final java.util.Set<FindingKind> ALONGSIDE_KINDS = java.util.EnumSet.of(FindingKind.SHIFT,
            FindingKind.SHAPE_CHANGE, FindingKind.MISSING_RATE_CHANGE, FindingKind.RELATIONSHIP_CHANGE,
            FindingKind.CODE_APPEARED, FindingKind.CODE_VANISHED, FindingKind.HEAPING, FindingKind.DIGIT_PREFERENCE,
            FindingKind.SKIPPED);

    private static Collected collect(ScreenedWave baseline, ScreenedWave current, DesignSummary baselineDesign,
                                     DesignSummary currentDesign, double alpha, String what,
                                     List<Comparison> alsoJudged, LocationHistory history) {
        VariableComparator comparator = new VariableComparator(1 - alpha);
        WeightedComparator weighted = new WeightedComparator(1 - alpha);
        List<Comparison> comparisons = new ArrayList<>();
        List<Finding> plain = new ArrayList<>();
        Map<String, Double> summarised = new LinkedHashMap<>();
        for (VariableConfig v : current.variables()) {
            ColumnTally ct = current.tally(v.name());
            if (ct == null) {
                continue;
            }
            ColumnTally bt = baseline == null ? null : baseline.tally(v.name());
            double error = Math.max(ct.binning().relativeError(), bt == null ? 0 : bt.binning().relativeError());
            if (error > 0) {
                summarised.put(v.name(), error);
            }
            List<Comparison> mine = new ArrayList<>();
            List<Finding> myPlain = new ArrayList<>();
            try {
                judgeVariable(comparator, weighted, v, ct, bt, current, baseline, baselineDesign, currentDesign,
                        history, mine, myPlain);
            } catch (RuntimeException e) {
                // A value no method foresaw, in screening, data-quality checks or comparison, must cost one variable
                // its comparison, never the whole run.
                LOG.warn("variable {} of {} could not be compared: {}", v.name(), what, e.toString(), e);
                mine.clear();
                myPlain.clear();
                myPlain.add(Finding.dataQuality(v.name(), FindingKind.SKIPPED, null, null, "Not compared: the"
                        + " answers could not be analysed (" + e.getClass().getSimpleName() + ": "
                        + String.valueOf(e.getMessage()).lines().findFirst().orElse("") + ").", null));
            }
            comparisons.addAll(mine);
            plain.addAll(myPlain);
        }
        comparisons.addAll(alsoJudged);
        return new Collected(comparisons, plain, summarised);
    }

    /**
     * The dataset's first waves with rows before {@code wave}, up to {@link LocationTestChoice#HISTORY_WAVES}, as
     * stored summaries (a baseline already read is taken as it is); null for the first wave.
     */
    private LocationHistory history(DatasetConfig d, WaveSource source, List<WaveInfo> listed, String wave,
                                    List<String> against, List<WaveProfile> baselines, String againstLabel) {
        List<WaveProfile> first = new ArrayList<>();
        for (WaveInfo w : listed) {
            if (w.wave().equals(wave) || first.size() == LocationTestChoice.HISTORY_WAVES) {
                break;
            }
            if (w.rows() > 0) {
                int i = against.indexOf(w.wave());
                // a summary read again for another configuration is noted where it is a baseline, not here
                first.add(i >= 0 ? baselines.get(i) : baselineProfile(d, source, w.wave(), List.of(),
                        new ArrayList<>()));
            }
        }
        return againstLabel == null ? null : new LocationHistory(first, againstLabel);
    }

    /** Relationship drift of the configured pairs: comparisons for the run's family, skip notices beside them. */
    private static void relationships(WardenConfig cfg, DatasetConfig d, Screened screened, WaveProfile current,
                                      WaveProfile baseline, List<Comparison> comparisons, List<Finding> plain) {
        if (d.relationships().isEmpty()) {
            return;
        }
        RelationshipFindings.of(d.relationships(), current, baseline, screened.current(), screened.baseline(),
                1 - cfg.alpha(), comparisons, plain);
    }

    private static void judgeVariable(VariableComparator comparator, WeightedComparator weighted, VariableConfig v,
                                      ColumnTally ct, ColumnTally bt, ScreenedWave current, ScreenedWave baseline,
                                      DesignSummary bd, DesignSummary cd, LocationHistory history,
                                      List<Comparison> comparisons,
                                      List<Finding> plain) {
        FaultPoints.hit(FaultPoints.JUDGE_VARIABLE + v.name());
        ScreenedVariable sc = current.get(v.name()).orElseThrow();
        ScreenedVariable sb = bt == null ? null : baseline.get(v.name()).orElseThrow();
        (sc.weighted() == null ? VariableComparisons.reference(comparator, v, sc) : WeightedComparisons.reference(weighted, v, sc, ct, cd)
                .or(() -> VariableComparisons.reference(comparator, v, sc))).ifPresent(comparisons::add);
        DataQualityFindings.Result dq = DataQualityFindings.of(v, ct, sc, sb, comparator);
        plain.addAll(dq.findings());
        comparisons.addAll(dq.rateComparisons());
        if (sb == null) {
            return;
        }
        boolean weigh = WeightedComparisons.applies(sb, sc);
        WeightedComparator.Design design = weigh && bd != null && cd != null
                ? WeightedComparisons.design(v, bt, ct, sb, sc, bd, cd) : null;
        VariableComparisons.compare(comparator, v, sb, sc, ct, bt, weigh ? weighted : null, design,
                LocationHistory.choice(v, history, sb)).ifPresentOrElse(c -> {
            comparisons.add(c);
            if (v.kind() == VariableKind.CONTINUOUS) {
                comparisons.add(weigh ? WeightedComparisons.shape(weighted, v, sb, sc, design)
                        : comparator.shape(v.name(), sb.numeric(), sc.numeric(), v.unit()));
            }
        }, () -> {
            String why = VariableComparisons.skipReason(v, sb, sc, ct, bt);
            if (why != null) {
                plain.add(Finding.dataQuality(v.name(), FindingKind.SKIPPED, sb.validN(), sc.validN(),
                        "Not compared: " + why + ".", null));
            }
        });
    }

    private WaveProfile profile(Handle h, DatasetConfig d, WaveSource source, String wave, LongConsumer progress) {
        return readProfile(h, d, source, wave, scanner, progress);
    }

    /** One wave's summary: the table's columns from the catalog, the monitored ones read in one pass. */
    public static WaveProfile readProfile(Handle h, DatasetConfig d, WaveSource source, String wave, Scanner scanner,
                                          LongConsumer progress) {
        List<SourceColumn> all = SourceCatalog.columns(h, source.tableFor(wave));
        Map<String, ColumnType> schema = new LinkedHashMap<>();
        all.forEach(c -> schema.put(c.name(), c.type()));
        List<SourceColumn> monitored = all.stream()
                .filter(c -> !d.isBookkeeping(c.name())).toList();
        SourceColumn weight = column(all, d.weightColumn());
        WaveScanner.Design design = d.design() == null ? null
                : new WaveScanner.Design(column(all, d.design().strata()), column(all, d.design().clusters()));
        WaveScanner.WaveScan scan = scanner.scan(h, source, wave, monitored, weight, design, pairs(d, monitored),
                domains(d, all), progress);
        return new WaveProfile(wave, scan.rows(), schema, scan.columns(), scan.weights(), scan.design(),
                scan.pairs(), scan.domains());
    }

    /**
     * The dataset's breakdown columns this wave's table has (monitored or excluded alike); a column missing from
     * this wave's table has no domains in its summary.
     */
    static WaveScanner.Domains domains(DatasetConfig d, List<SourceColumn> all) {
        if (d.breakdowns() == null || d.breakdowns().isEmpty()) {
            return WaveScanner.Domains.NONE;
        }
        List<SourceColumn> present = d.breakdowns().columns().stream().map(name -> column(all, name))
                .filter(java.util.Objects::nonNull).toList();
        return new WaveScanner.Domains(present, d.breakdowns().maxDomains());
    }

    private static SourceColumn column(List<SourceColumn> all, String name) {
        return name == null ? null : all.stream().filter(c -> c.name().equals(name)).findFirst().orElse(null);
    }

    /** The configured relationships whose two columns this wave has as monitored numbers. */
    static List<PairSpec> pairs(DatasetConfig d, List<SourceColumn> monitored) {
        Map<String, ColumnType> types = new LinkedHashMap<>();
        monitored.forEach(c -> types.put(c.name(), c.type()));
        return pairs(d, types);
    }

    /** The same from a column layout: the relationships whose two columns are monitored numbers there. */
    static List<PairSpec> pairs(DatasetConfig d, Map<String, ColumnType> schema) {
        java.util.Set<String> numbers = new java.util.HashSet<>();
        schema.forEach((name, type) -> {
            if (type.isNumeric() && !d.isBookkeeping(name)) {
                numbers.add(name);
            }
        });
        return d.relationships().stream().filter(r -> numbers.contains(r.x()) && numbers.contains(r.y()))
                .map(r -> new PairSpec(r.x(), r.y())).toList();
    }

    /** True when a stored summary lacks the pairs of a relationship it has both columns for. */
    private static boolean lacksPairs(DatasetConfig d, WaveProfile p) {
        return d.relationships().stream().anyMatch(r -> isNumber(p, r.x()) && isNumber(p, r.y())
                && p.pair(r.x(), r.y()).isEmpty());
    }

    private static boolean isNumber(WaveProfile p, String column) {
        return p.columns().containsKey(column) && p.schema().get(column) != null && p.schema().get(column).isNumeric();
    }

    /** The panel's pairs when the dataset has a respondent key and the wave one baseline: one more statement. */
    private PairedPanel.Panel panel(DatasetConfig d, WaveSource source, List<String> against, WaveProfile baseline,
                                    WaveProfile current, Screened screened) {
        PanelPairs plan = PanelPairs.plan(d, against, baseline, current, screened);
        if (plan == null) {
            return null;
        }
        return plan.needsRead() ? session.source().withHandle(h -> plan.read(h, source, pairReader))
                : plan.read(null, source, pairReader);
    }

    /**
     * The stored summary of an earlier wave, read from the source once if it was never stored, lacks columns or
     * the pairs of a configured relationship, or was made under another configuration (its {@link SummaryKey}
     * differs: weights, design, codebook codes, kinds, ranges or the columns read changed since). A summary read
     * again for that reason is named in {@code notes}.
     */
    private WaveProfile baselineProfile(DatasetConfig d, WaveSource source, String wave, List<String> needed,
                                        List<String> notes) {
        Optional<ResultsStore.StoredSummary> stored = session.store().latestSummary(d.name(), wave);
        if (stored.isPresent()) {
            WaveProfile p = stored.get().profile();
            boolean sameConfig = SummaryKey.of(d, p.schema()).value().equals(stored.get().summaryKey());
            boolean complete = needed.stream().allMatch(c -> p.columns().containsKey(c) || !p.schema().containsKey(c))
                    && !lacksPairs(d, p);
            if (complete && sameConfig) {
                return p;
            }
            if (!sameConfig) {
                String note = "The stored summary of baseline wave " + wave + " was made under another configuration"
                        + " (columns read, weights, design, codebook codes, kinds, ranges or relationships differ), so"
                        + " the baseline summary was recomputed from the source.";
                LOG.info("dataset {}: {}", d.name(), note);
                notes.add(note);
            }
        }
        WaveProfile p = session.source().withHandle(h -> profile(h, d, source, wave, null));
        session.store().saveSummary(d.name(), p, p.checksum(), SummaryKey.of(d, p.schema()).value());
        return p;
    }
}
