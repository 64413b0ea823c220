package org.wavewarden.codebook;

import org.wavewarden.config.CodebookSource;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.WardenConfig;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.List;

/**
 * Reads each dataset's {@code codebook:} file and merges it with the YAML's variables, so that every consumer of the
 * configuration (check, run, daemon, scaffold) sees the merged variables. Called once where a config is loaded.
 */
public final class Codebooks {

    private Codebooks() {
    }

    /**
     * @param config the configuration with merged variables and each codebook's digest
     * @param report one line per merge decision, each led by its dataset's name, for standard error
     */
    public record Resolved(WardenConfig config, List<String> report) {
    }

    /**
     * @param configDir the folder of the config file: codebook paths are relative to it
     * @throws ConfigException naming {@code datasets[i].codebook.ddi} (or {@code .csv}) when the file is missing,
     *                         unreadable or not a codebook of its format
     */
    public static Resolved resolve(WardenConfig config, Path configDir) {
        List<DatasetConfig> datasets = new ArrayList<>();
        List<String> report = new ArrayList<>();
        for (int i = 0; i < config.datasets().size(); i++) {
            DatasetConfig d = config.datasets().get(i);
            CodebookSource source = d.codebook();
            if (source == null || source.sha256() != null) {
                datasets.add(d);
                continue;
            }
            String key = source.key(i);
            Path file = configDir == null ? Path.of(source.path()) : configDir.resolve(source.path());
            byte[] bytes;
            try {
                bytes = Files.readAllBytes(file);
            } catch (IOException e) {
                throw new ConfigException(key, "cannot read the codebook " + source.path() + ": "
                        + (e instanceof java.nio.file.NoSuchFileException ? "no such file (relative paths start at"
                        + " the config file's folder)" : e.getClass().getSimpleName()));
            }
            DatasetCodebook codebook;
            try {
                codebook = source.format().equals("ddi") ? DdiCodebook.read(file) : CsvCodebook.read(file);
            } catch (IOException e) {
                throw new ConfigException(key, e instanceof CodebookFormatException ? e.getMessage()
                        : "cannot read the codebook " + source.path() + ": " + e.getClass().getSimpleName());
            }
            CodebookMerge.Merged merged = CodebookMerge.merge(d.variables(), codebook, d::isBookkeeping);
            report.add(d.name() + ": codebook " + codebook.source() + " (" + codebook.variables().size()
                    + " variables) merged with " + d.variables().size() + " from the YAML; the YAML wins");
            merged.report().forEach(line -> report.add(d.name() + ": " + line));
            datasets.add(d.withVariables(merged.variables(), source.read(sha256(bytes))));
        }
        return new Resolved(new WardenConfig(config.source(), config.results(), config.alpha(), config.fdr(),
                datasets, config.daemon()), report);
    }

    private static String sha256(byte[] bytes) {
        try {
            return HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(bytes));
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
    }
}
