package org.wavewarden.cli;

import com.zaxxer.hikari.HikariDataSource;
import org.jdbi.v3.core.Jdbi;
import org.wavewarden.codebook.CsvCodebook;
import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.DdiCodebook;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.db.Databases;
import org.wavewarden.deliver.DataText;
import org.wavewarden.load.CaseImporter;
import org.wavewarden.load.CaseSource;
import org.wavewarden.load.CsvWaveImporter;
import org.wavewarden.load.spss.SavFiles;
import org.wavewarden.load.spss.SavFormatException;
import org.wavewarden.store.ResultsSchema;
import org.wavewarden.store.WaveCodebooks;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.SQLException;
import java.time.Instant;
import java.util.Locale;
import java.util.concurrent.Callable;

@Command(name = "import", mixinStandardHelpOptions = true,
        description = "Load one wave into the dataset's table: an SPSS system file (.sav, .zsav) with its dictionary,"
                + " or a CSV file (header row; .csv, .tsv, optionally .gz), with COPY in one transaction. The"
                + " codebook the wave came with (the .sav dictionary, or --codebook) is saved in the results schema."
                + " This is the one"
                + " command that writes to the source database, so it opens its own writable session.")
final class ImportCommand implements Callable<Integer> {

    @Mixin
    ConfigOption config;
    @Mixin
    DatasetOption dataset;
    @Option(names = "--wave", required = true, paramLabel = "WAVE", description = "wave label for every row")
    String wave;
    @Option(names = "--replace", description = "replace the wave's rows (and its saved codebook) if it already has"
            + " some")
    boolean replace;
    @Option(names = "--create", description = "create the dataset's table from the file when it does not exist"
            + " (types from the file's dictionary, or inferred; printed)")
    boolean create;
    @Option(names = "--codebook", paramLabel = "FILE", description = "the codebook of a CSV file: DDI-Codebook 2.5"
            + " (.xml) or a CSV codebook (.csv); saved with the wave")
    Path codebookFile;
    @Parameters(paramLabel = "FILE", description = "the file to load: .sav, .zsav, .csv, .tsv, .csv.gz or .tsv.gz")
    Path file;
    @Option(names = "--delimiter", paramLabel = "D", description = "the CSV field delimiter: ',' ';' '|' or tab"
            + " (\"tab\" or \\t); guessed from the header and first rows when not given")
    String delimiter;
    @Option(names = "--encoding", paramLabel = "CHARSET", description = "the file's character encoding (UTF-8,"
            + " windows-1252, ISO-8859-1, UTF-16, ...); when not given: a byte order mark, else UTF-8 when the first"
            + " 4 MB are valid UTF-8, else windows-1252")
    String encoding;

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    /** What kind of file is being loaded, from its name. */
    enum FileKind { SPSS, CSV }

    static FileKind kindOf(Path file) {
        String name = file.getFileName().toString().toLowerCase(Locale.ROOT);
        if (name.endsWith(".sav") || name.endsWith(".zsav")) {
            return FileKind.SPSS;
        }
        // A tab-separated file is a CSV file with another delimiter, which the reader guesses or is given.
        if (name.endsWith(".csv") || name.endsWith(".csv.gz") || name.endsWith(".tsv") || name.endsWith(".tsv.gz")) {
            return FileKind.CSV;
        }
        throw new ConfigException("FILE", "cannot tell what " + DataText.visible(file.getFileName().toString())
                + " is from its name: expected .sav or .zsav (SPSS system file), .csv, .tsv, .csv.gz or .tsv.gz");
    }

    @Override
    public Integer call() throws Exception {
        WardenConfig c = config.load();
        DatasetConfig d = dataset.pick(c);
        if (d.table() == null) {
            throw new ConfigException("tablePattern", "import loads into a table with a wave column; this dataset has"
                    + " one table per wave");
        }
        var table = Identifiers.TableName.parse("table", d.table());
        FileKind kind = kindOf(file);
        var format = CsvWaveImporter.CsvFormat.parse(delimiter, encoding);
        if (kind == FileKind.SPSS && (delimiter != null || encoding != null)) {
            throw new ConfigException(delimiter != null ? "--delimiter" : "--encoding", "an SPSS system file says its"
                    + " own encoding and has no delimiter; these options are for CSV files");
        }
        if (!Files.isRegularFile(file)) {
            throw new ConfigException("FILE", "no file " + file);
        }
        if (kind == FileKind.SPSS && codebookFile != null) {
            throw new ConfigException("--codebook", "an SPSS system file carries its own dictionary; --codebook is"
                    + " for CSV files");
        }
        // Read before anything is written, so a codebook that cannot be read stops the import, not the save.
        DatasetCodebook given = codebookFile == null ? null : readCodebook(codebookFile);
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        // The results schema is touched only when the wave has a codebook to keep (or one to forget on --replace):
        // a plain CSV import needs nothing but the source.
        boolean keepsCodebook = kind == FileKind.SPSS || given != null || replace;
        boolean ownResults = keepsCodebook && c.results().connection() != null;
        // Two connections: Flyway holds one for its lock while it migrates with the other.
        try (HikariDataSource ds = Databases.open(c.source(), null, "source", false, System.getenv(), 2);
             HikariDataSource rs = ownResults
                     ? Databases.open(c.results().connection(), null, "results", false, System.getenv(), 2) : null) {
            // A wrong password is reported at once rather than after the pool's connection timeout.
            Databases.firstContact(ds, "source");
            HikariDataSource results = !keepsCodebook ? null : ownResults ? rs : ds;
            if (ownResults) {
                Databases.firstContact(rs, "results");
            }
            // The results schema is brought up to date first, so an unreachable or outdated results store stops
            // the import before its rows are committed.
            if (keepsCodebook) {
                ResultsSchema.migrate(results, c.results().schema());
            }
            DatasetCodebook saved;
            long rows;
            try (Connection conn = ds.getConnection()) {
                if (kind == FileKind.SPSS) {
                    try (CaseSource cases = SavFiles.open(file)) {
                        var loaded = CaseImporter.loadWithCodebook(conn, table, d.waveColumn(), wave, cases, replace,
                                create, out, Progress.rows("importing " + file.getFileName(), err));
                        rows = loaded.imported().rows();
                        saved = loaded.codebook();
                    } catch (SavFormatException e) {
                        // A damaged delivery is bad input like a CSV row that cannot be read; the import's
                        // transaction, if it had begun, was rolled back before this.
                        throw new CsvWaveImporter.ImportRefusedException(e.getMessage() + "; nothing was imported",
                                e);
                    }
                } else {
                    var r = CsvWaveImporter.load(conn, table, d.waveColumn(), wave, file, replace,
                            Progress.rows("importing " + file.getFileName() + " (bytes)", err), format, create, given,
                            out);
                    rows = r.rows();
                    saved = given;
                }
                Progress.done(err);
            }
            out.println("imported " + rows + " rows into " + table + " as wave " + DataText.visible(wave));
            if (!keepsCodebook) {
                return Main.OK;
            }
            return saveCodebook(new WaveCodebooks(Jdbi.create(results), c.results().schema()), d.name(), saved, out,
                    err);
        }
    }

    static DatasetCodebook readCodebook(Path codebook) {
        String name = codebook.getFileName().toString().toLowerCase(Locale.ROOT);
        try {
            if (name.endsWith(".xml")) {
                return DdiCodebook.read(codebook);
            }
            if (name.endsWith(".csv")) {
                return CsvCodebook.read(codebook);
            }
        } catch (NoSuchFileException e) {
            throw new ConfigException("--codebook", "no file " + codebook);
        } catch (IOException e) {
            throw new ConfigException("--codebook", "cannot read " + codebook + ": " + e.getMessage());
        }
        throw new ConfigException("--codebook", "expected a DDI-Codebook file (.xml) or a CSV codebook (.csv) but got "
                + DataText.visible(codebook.getFileName().toString()));
    }

    /**
     * Saves the wave's codebook once its rows are committed (or forgets one saved with rows this import replaced).
     * The rows stay when this fails: the exit code and message say so, and the same import with --replace does both.
     */
    int saveCodebook(WaveCodebooks codebooks, String datasetName, DatasetCodebook codebook, PrintWriter out,
                     PrintWriter err) {
        try {
            if (codebook == null) {
                if (replace && codebooks.delete(datasetName, wave)) {
                    out.println("removed the codebook saved with the earlier rows of wave " + DataText.visible(wave));
                }
                return Main.OK;
            }
            codebooks.save(datasetName, wave, codebook, Instant.now());
        } catch (RuntimeException e) {
            err.println("the rows of wave " + DataText.visible(wave) + " are committed, but saving its codebook"
                    + " failed: " + reason(e) + "; run the same import again with --replace to load both");
            return Main.FAILED;
        }
        long labelled = codebook.variables().stream().filter(v -> !v.valueLabels().isEmpty()).count();
        long missing = codebook.variables().stream()
                .filter(v -> !v.missingCodes().isEmpty() || !v.missingRanges().isEmpty()).count();
        out.println("saved the codebook of wave " + DataText.visible(wave) + ": " + codebook.variables().size()
                + " variables, " + labelled + " with value labels, " + missing + " with missing values");
        return Main.OK;
    }

    /** The server's own words, without the statement and its bound values (a whole codebook) around them. */
    private static String reason(RuntimeException e) {
        for (Throwable t = e; t != null; t = t.getCause()) {
            if (t instanceof SQLException s) {
                return DataText.visible(String.valueOf(s.getMessage()));
            }
        }
        return e.getClass().getSimpleName();
    }
}
