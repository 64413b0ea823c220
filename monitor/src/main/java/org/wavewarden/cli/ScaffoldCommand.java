package org.wavewarden.cli;

import org.jdbi.v3.core.Handle;
import org.wavewarden.codebook.ConfigScaffold;
import org.wavewarden.codebook.CsvCodebook;
import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.DdiCodebook;
import org.wavewarden.config.CompareWith;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.ConnectionConfig;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.config.WaveOrder;
import org.wavewarden.deliver.DataText;
import org.wavewarden.pipeline.Session;
import org.wavewarden.pipeline.WaveJudge;
import org.wavewarden.profile.WaveProfile;
import org.wavewarden.read.BinaryWaveScanner;
import org.wavewarden.read.SourceCatalog;
import org.wavewarden.read.SourceColumn;
import org.wavewarden.read.WaveInfo;
import org.wavewarden.read.WaveListing;
import org.wavewarden.read.WaveScanner;
import org.wavewarden.read.WaveSource;
import org.wavewarden.store.WaveCodebooks;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;

/**
 * Writes a complete, annotated configuration for one table from its codebook and its newest wave
 * ({@link ConfigScaffold}). The connection comes from a config ({@code --config}, with {@code --dataset} to take that
 * dataset's table) or from the command line ({@code --jdbc-url}); the codebook from {@code --codebook}, else the one
 * saved with the newest imported wave.
 */
@Command(name = "scaffold", mixinStandardHelpOptions = true,
        description = "Write a complete, annotated YAML configuration for a table from its codebook and newest wave.")
final class ScaffoldCommand implements Callable<Integer> {

    @Option(names = {"-c", "--config"}, paramLabel = "FILE",
            description = "a configuration whose source and results connections to use")
    Path configFile;
    @Option(names = {"-d", "--dataset"}, paramLabel = "NAME", description = "scaffold this dataset of --config")
    String dataset;
    @Option(names = "--table", paramLabel = "SCHEMA.TABLE", description = "the table holding the waves")
    String table;
    @Option(names = "--wave-column", paramLabel = "COLUMN", description = "the column naming each row's wave")
    String waveColumn;
    @Option(names = "--name", paramLabel = "NAME", description = "the dataset's name (default: the table's name)")
    String name;
    @Option(names = "--jdbc-url", paramLabel = "URL", description = "the source server, without --config")
    String jdbcUrl;
    @Option(names = "--user", paramLabel = "ROLE", description = "the source login, with --jdbc-url")
    String user;
    @Option(names = "--password-env", paramLabel = "VAR",
            description = "environment variable holding the source password, with --jdbc-url")
    String passwordEnv;
    @Option(names = "--results-schema", paramLabel = "SCHEMA", defaultValue = "wavewarden",
            description = "the results schema on the source server, with --jdbc-url (default: ${DEFAULT-VALUE})")
    String resultsSchema;
    @Option(names = "--codebook", paramLabel = "FILE",
            description = "a DDI-Codebook 2.5 XML file (.xml) or a CSV codebook (.csv); default: the codebook saved"
                    + " with the newest imported wave")
    Path codebookFile;
    @Option(names = "--out", paramLabel = "FILE", description = "write here instead of to standard output")
    Path out;
    @Option(names = "--force", description = "overwrite --out when it exists")
    boolean force;

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() throws IOException {
        WardenConfig config = connection();
        DatasetConfig d = datasetToRead(config);
        if (out != null && Files.exists(out) && !force) {
            throw new ConfigException("--out", out + " exists; give --force to overwrite it");
        }
        DatasetCodebook file = codebookFile == null ? null : readCodebook(codebookFile);
        var err = spec.commandLine().getErr();
        String yaml;
        try (Session s = Session.open(config, null, System.getenv())) {
            s.migrate();
            WaveSource source = WaveSource.of(d, key(config, d));
            Scan scan = s.source().withHandle(h -> scan(h, d, source, key(config, d)));
            DatasetCodebook codebook = file;
            if (codebook == null) {
                codebook = new WaveCodebooks(s.store().jdbi(), config.results().schema()).load(d.name(), scan.wave())
                        .orElse(null);
                String wave = DataText.visible(scan.wave());
                err.println(codebook == null ? "no codebook given and none saved with wave " + wave
                        + ": every kind is inferred" : "codebook: the one saved with wave " + wave);
            }
            yaml = ConfigScaffold.yaml(new ConfigScaffold.Input(config.source(), config.results(), d.name(),
                    d.table() != null ? d.table() : d.tablePattern(), d.waveColumn(), scan.columns(), scan.wave(),
                    scan.profile().columns(), codebook, d.weightColumn(), d.respondentKey(), d.exclude()));
        }
        if (out == null) {
            spec.commandLine().getOut().print(yaml);
            spec.commandLine().getOut().flush();
        } else {
            Files.writeString(out, yaml, StandardCharsets.UTF_8);
            err.println("wrote " + out);
        }
        return Main.OK;
    }

    private record Scan(List<SourceColumn> columns, String wave, WaveProfile profile) {
    }

    /** The newest wave with rows, read as a run reads it. */
    /** The key errors about the dataset name: its place in the config, or the command line's options. */
    private String key(WardenConfig config, DatasetConfig d) {
        return dataset == null ? "--table" : "datasets[" + config.datasets().indexOf(d) + "]";
    }

    private Scan scan(Handle h, DatasetConfig d, WaveSource source, String key) {
        if (!source.onePerWave()) {
            String tableKey = dataset == null ? "--table" : key + ".table";
            if (!SourceCatalog.tableExists(h, source.table())) {
                throw new ConfigException(tableKey, "table " + source.table() + " does not exist in the source"
                        + " database (or this role cannot see it)");
            }
            List<SourceColumn> all = SourceCatalog.columns(h, source.table());
            if (all.stream().noneMatch(c -> c.name().equals(d.waveColumn()))) {
                throw new ConfigException(dataset == null ? "--wave-column" : key + ".waveColumn",
                        "column " + d.waveColumn() + " does not exist in " + source.table() + "; it has "
                                + all.stream().map(SourceColumn::name).toList());
            }
        }
        List<WaveInfo> waves = WaveListing.list(h, source, d.waveOrder());
        WaveInfo newest = null;
        for (WaveInfo w : waves) {
            if (w.rows() > 0) {
                newest = w;
            }
        }
        if (newest == null) {
            throw new ConfigException(dataset == null ? "--table" : "--dataset", "the table has no rows to scaffold"
                    + " from; import a wave first");
        }
        List<SourceColumn> columns = SourceCatalog.columns(h, source.tableFor(newest.wave()));
        WaveProfile profile = WaveJudge.readProfile(h, d, source, newest.wave(),
                new BinaryWaveScanner(WaveScanner.DEFAULT_MAX_DISTINCT)::scan, null);
        return new Scan(columns, newest.wave(), profile);
    }

    private WardenConfig connection() {
        if (configFile != null) {
            if (jdbcUrl != null || user != null || passwordEnv != null) {
                throw new ConfigException("--jdbc-url", "give either --config or --jdbc-url with --user, not both");
            }
            return ConfigLoader.load(configFile);
        }
        if (jdbcUrl == null) {
            throw new ConfigException("--config", "expected --config FILE, or --jdbc-url URL --user ROLE for the"
                    + " source server");
        }
        if (dataset != null) {
            throw new ConfigException("--dataset", "names a dataset of --config; without a config give --table and"
                    + " --wave-column");
        }
        String yaml = "source:\n  jdbcUrl: " + ConfigScaffold.quote(jdbcUrl) + "\n"
                + (user == null ? "" : "  user: " + ConfigScaffold.quote(user) + "\n")
                + (passwordEnv == null ? "" : "  passwordEnv: " + ConfigScaffold.quote(passwordEnv) + "\n")
                + "results: {schema: " + ConfigScaffold.quote(resultsSchema) + "}\n"
                + "datasets: [{name: scaffold, table: scaffold, waveColumn: wave}]\n";
        WardenConfig parsed = checkedAsOptions(yaml);
        return new WardenConfig(parsed.source(), parsed.results(), parsed.alpha(), parsed.fdr(), List.of(), null);
    }

    /** The options checked by the config's own rules, each error named by its option. */
    private static WardenConfig checkedAsOptions(String yaml) {
        try {
            return ConfigLoader.parse(yaml);
        } catch (ConfigException e) {
            String option = switch (e.key()) {
                case "source.jdbcUrl" -> "--jdbc-url";
                case "source.user" -> "--user";
                case "source.passwordEnv" -> "--password-env";
                case "results.schema" -> "--results-schema";
                default -> e.key();
            };
            throw new ConfigException(option, e.problem());
        }
    }

    private DatasetConfig datasetToRead(WardenConfig config) {
        if (dataset != null) {
            if (table != null || waveColumn != null) {
                throw new ConfigException("--dataset", "give either --dataset or --table with --wave-column, not"
                        + " both");
            }
            return config.dataset(dataset);
        }
        if (table == null || waveColumn == null) {
            throw new ConfigException(table == null ? "--table" : "--wave-column", "expected --table SCHEMA.TABLE"
                    + " and --wave-column COLUMN" + (configFile == null ? "" : ", or --dataset NAME"));
        }
        Identifiers.TableName t = Identifiers.TableName.parse("--table", table);
        Identifiers.require("--wave-column", waveColumn);
        String datasetName = name == null ? t.table() : Identifiers.require("--name", name);
        return new DatasetConfig(datasetName, t.toString(), waveColumn, null, WaveOrder.NATURAL, CompareWith.PREVIOUS,
                null, List.of(), List.of(), null, null, null, null, null, null, null, null);
    }

    private static DatasetCodebook readCodebook(Path file) throws IOException {
        if (!Files.isRegularFile(file)) {
            throw new ConfigException("--codebook", file + " is not a readable file");
        }
        String lower = file.getFileName().toString().toLowerCase(Locale.ROOT);
        if (lower.endsWith(".xml")) {
            return DdiCodebook.read(file);
        }
        if (lower.endsWith(".csv")) {
            return CsvCodebook.read(file);
        }
        throw new ConfigException("--codebook", "expected a DDI-Codebook XML file (.xml) or a CSV codebook (.csv)"
                + " but got " + file.getFileName());
    }
}
