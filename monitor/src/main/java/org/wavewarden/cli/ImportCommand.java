package org.wavewarden.cli;

import org.wavewarden.config.ConfigException;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.db.Databases;
import org.wavewarden.deliver.DataText;
import org.wavewarden.load.CsvWaveImporter;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

import java.nio.file.Path;
import java.sql.Connection;
import java.util.concurrent.Callable;

@Command(name = "import", mixinStandardHelpOptions = true,
        description = "Load a CSV file (header row; .csv or .csv.gz) into the dataset's table as one wave, with COPY."
                + " This is the one command that writes to the source database, so it opens its own writable session.")
final class ImportCommand implements Callable<Integer> {

    @Mixin
    ConfigOption config;
    @Mixin
    DatasetOption dataset;
    @Option(names = "--wave", required = true, paramLabel = "WAVE", description = "wave label for every row")
    String wave;
    @Option(names = "--replace", description = "replace the wave's rows if it already has some")
    boolean replace;
    @Option(names = "--delimiter", paramLabel = "D", description = "the CSV field delimiter: ',' ';' '|' or tab"
            + " (\"tab\" or \\t); guessed from the header and first rows when not given")
    String delimiter;
    @Option(names = "--encoding", paramLabel = "CHARSET", description = "the file's character encoding (UTF-8,"
            + " windows-1252, ISO-8859-1, UTF-16, ...); when not given: a byte order mark, else UTF-8 when the first"
            + " 4 MB are valid UTF-8, else windows-1252")
    String encoding;
    @Parameters(paramLabel = "CSV", description = "the file to load")
    Path csv;

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() throws Exception {
        WardenConfig c = config.load();
        DatasetConfig d = dataset.pick(c);
        if (d.table() == null) {
            throw new ConfigException("tablePattern", "import loads into a table with a wave column; this dataset has"
                    + " one table per wave");
        }
        var table = Identifiers.TableName.parse("table", d.table());
        var format = CsvWaveImporter.CsvFormat.parse(delimiter, encoding);
        try (var ds = Databases.open(c.source(), null, "source", false, System.getenv(), 1)) {
            // A wrong password is reported at once rather than after the pool's connection timeout.
            Databases.firstContact(ds, "source");
            try (Connection conn = ds.getConnection()) {
                var err = spec.commandLine().getErr();
                var r = CsvWaveImporter.load(conn, table, d.waveColumn(), wave, csv, replace,
                        Progress.rows("importing " + csv.getFileName() + " (bytes)", err), format,
                        spec.commandLine().getOut());
                Progress.done(err);
                spec.commandLine().getOut().println("imported " + r.rows() + " rows into " + table + " as wave "
                        + DataText.visible(r.wave()));
            }
        }
        return Main.OK;
    }
}
