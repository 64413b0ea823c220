package org.wavewarden.pipeline;

import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.read.PairSpec;

import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HexFormat;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;

/**
 * What a stored wave summary depends on besides the wave's rows: the columns read and their types, the weight and
 * design columns, every declared variable's kind, codebook codes and missing ranges, range and levels, the tallied pairs, the
 * breakdown columns and their cap on domains, and the summary format. Two reads of the same rows under equal keys give equal summaries; a stored summary under another
 * key (weights added since, a code declared, a kind changed) is not reused but read again.
 *
 * @param value a SHA-256 over a canonical rendering, in hex
 */
public record SummaryKey(String value) {

    /** Raise when what a summary holds, or how it is tallied, changes: every stored summary is then read again. */
    public static final int FORMAT_VERSION = 1;

    /**
     * The key of a wave with the given column layout (every column of its table and its type, as
     * {@link org.wavewarden.profile.WaveProfile#schema()} holds it) under the dataset's configuration.
     */
    public static SummaryKey of(DatasetConfig d, Map<String, ColumnType> schema) {
        List<String> lines = new ArrayList<>();
        lines.add("format " + FORMAT_VERSION);
        Map<String, ColumnType> sorted = new TreeMap<>(schema);
        sorted.forEach((column, type) -> {
            if (!d.isBookkeeping(column)) {
                lines.add("read " + text(column) + " " + type);
            }
        });
        lines.add("weight " + text(d.weightColumn()) + " " + (d.weightColumn() == null ? "" : sorted.get(d.weightColumn())));
        lines.add("design " + (d.design() == null ? "none"
                : text(d.design().strata()) + " " + text(d.design().clusters())));
        List<VariableConfig> variables = new ArrayList<>(d.variables());
        variables.sort(Comparator.comparing(VariableConfig::name));
        for (VariableConfig v : variables) {
            StringBuilder s = new StringBuilder("variable ").append(text(v.name())).append(' ').append(v.kind());
            if (v.range() != null) {
                s.append(" range ").append(v.range().min()).append(' ').append(v.range().max());
            }
            for (MissingCodeSpec c : v.missingCodes()) {
                s.append(" code ").append(text(c.value())).append(' ').append(text(c.reason()));
            }
            for (MissingRangeSpec r : v.missingRanges()) {
                s.append(" missing-range ").append(r.low()).append(' ').append(r.high()).append(' ')
                        .append(text(r.reason()));
            }
            v.levels().forEach(l -> s.append(" level ").append(text(l)));
            lines.add(s.toString());
        }
        List<PairSpec> pairs = new ArrayList<>(WaveJudge.pairs(d, sorted));
        pairs.sort(Comparator.comparing(PairSpec::x).thenComparing(PairSpec::y));
        pairs.forEach(p -> lines.add("pair " + text(p.x()) + " " + text(p.y())));
        // Only a dataset with breakdowns adds their line, so the key of every summary without them is what it was;
        // a summary stored before breakdowns were configured then differs and is read again with its domains.
        if (d.breakdowns() != null && !d.breakdowns().isEmpty()) {
            StringBuilder s = new StringBuilder("breakdowns ").append(d.breakdowns().maxDomains());
            d.breakdowns().columns().forEach(c -> s.append(' ').append(text(c)).append(' ')
                    .append(sorted.containsKey(c) ? sorted.get(c) : "absent"));
            lines.add(s.toString());
        }
        try {
            MessageDigest md = MessageDigest.getInstance("SHA-256");
            for (String line : lines) {
                md.update(line.getBytes(StandardCharsets.UTF_8));
                md.update((byte) '\n');
            }
            return new SummaryKey(HexFormat.of().formatHex(md.digest()));
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
    }

    /** Length-prefixed, so that no two different lists of names render alike. */
    private static String text(String s) {
        return s == null ? "-" : s.length() + ":" + s;
    }
}
