package org.wavewarden.read;

import org.jdbi.v3.core.Handle;
import org.postgresql.PGConnection;
import org.postgresql.copy.CopyOut;
import org.wavewarden.config.Identifiers;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.JointTally;
import org.wavewarden.profile.PairCounter;
import org.wavewarden.profile.RelativeBins;

import java.sql.Connection;
import java.sql.SQLException;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.function.LongConsumer;

/**
 * The reference the binary scanner is held to: reads one wave through text {@code COPY (SELECT ...) TO STDOUT}, whose
 * fields are exactly what PostgreSQL's output functions print, and tallies each column's distinct values as they
 * arrive. It reads no sampling design. Its limits are those of {@link BinaryWaveScanner#BinaryWaveScanner(int, int)}.
 */
public record TextWaveScanner(int maxDistinct, int exactNumbers) implements WaveScanner {

    /** With the numeric limit the binary scanner defaults to. */
    public TextWaveScanner(int maxDistinct) {
        this(maxDistinct, WaveScanner.DEFAULT_EXACT_NUMBERS);
    }

    /**
     * This reference scanner reads no sampling design and no breakdowns (the binary scanner does).
     *
     * @throws IllegalArgumentException when a design or breakdown columns are given
     */
    @Override
    public WaveScanner.WaveScan scan(Handle h, WaveSource source, String wave, List<SourceColumn> columns,
                                     SourceColumn weight, WaveScanner.Design design, List<PairSpec> pairs,
                                     WaveScanner.Domains domains, LongConsumer progress) {
        if (design != null) {
            throw new IllegalArgumentException("the text scanner reads no sampling design; use the binary scanner");
        }
        if (domains != null && !domains.isEmpty()) {
            throw new IllegalArgumentException("the text scanner reads no breakdowns; use the binary scanner");
        }
        return read(h, source, wave, columns, weight, pairs, progress);
    }

    /** The joint tallies of pairs count rows where both cells are finite numbers ({@link PairCounter}). */
    private WaveScanner.WaveScan read(Handle h, WaveSource source, String wave, List<SourceColumn> columns,
                                      SourceColumn weight, List<PairSpec> pairs, LongConsumer progress) {
        boolean weighted = weight != null;
        List<SourceColumn> read = columns;
        if (weighted) {
            read = new ArrayList<>(columns);
            read.add(weight);
        }
        String sql = copySql(h, source, wave, read);
        int k = columns.size();
        int fieldsPerRow = read.size();
        List<Map<String, double[]>> weightSums = new ArrayList<>(weighted ? k : 0);
        long badWeights = 0;
        List<Map<String, long[]>> tallies = new ArrayList<>(k);
        RelativeBins[] bins = new RelativeBins[k];
        long[] nulls = new long[k];
        boolean[] truncated = new boolean[k];
        for (int i = 0; i < k; i++) {
            tallies.add(new HashMap<>());
            weightSums.add(weighted ? new HashMap<>() : null);
        }
        int[][] pairAt = new int[pairs.size()][];
        PairCounter[] joint = new PairCounter[pairs.size()];
        for (int j = 0; j < pairs.size(); j++) {
            pairAt[j] = pairs.get(j).indexIn(columns);
            joint[j] = new PairCounter();
        }
        long rows = 0;
        String[] fields = new String[fieldsPerRow];
        try {
            Connection c = h.getConnection();
            try (var st = c.createStatement()) {
                st.execute("SET DateStyle = 'ISO, YMD'"); // dates in one text form whatever the server default
            }
            CopyOut copy = c.unwrap(PGConnection.class).getCopyAPI().copyOut(sql);
            byte[] row;
            while ((row = copy.readFromCopy()) != null) {
                int n = CopyTextRow.split(row, fields);
                if (n != Math.max(fieldsPerRow, 1)) {
                    throw new IllegalStateException("COPY row had " + n + " fields, expected " + fieldsPerRow);
                }
                double w = Double.NaN;
                if (weighted) {
                    w = Decode.weight(fields[k]);
                    if (Double.isNaN(w)) {
                        badWeights++;
                    }
                }
                for (int i = 0; i < k; i++) {
                    String v = fields[i];
                    if (v == null) {
                        nulls[i]++;
                        continue;
                    }
                    if (bins[i] != null) {
                        bins[i].add(number(columns.get(i), v), w);
                        continue;
                    }
                    boolean numeric = columns.get(i).type().isNumeric();
                    // A number keeps its full text however long (-1e-300 takes 303 characters): a stand-in is no number.
                    if (v.length() > WaveScanner.MAX_VALUE_CHARS && !numeric) {
                        v = ValueText.shortened(v);
                    }
                    Map<String, long[]> t = tallies.get(i);
                    long[] cell = t.get(v);
                    if (cell != null) {
                        cell[0]++;
                    } else if (t.size() < (numeric ? exactNumbers : maxDistinct)) {
                        t.put(v, new long[] {1});
                    } else if (numeric) {
                        bins[i] = summarise(columns.get(i), t, weightSums.get(i));
                        tallies.set(i, null);
                        weightSums.set(i, null);
                        bins[i].add(number(columns.get(i), v), w);
                        continue;
                    } else {
                        truncated[i] = true;
                        continue;
                    }
                    if (weighted && !Double.isNaN(w)) {
                        double[] ws = weightSums.get(i).computeIfAbsent(v, x -> new double[2]);
                        ws[0] += w;
                        ws[1] += w * w;
                    }
                }
                for (int j = 0; j < joint.length; j++) {
                    String x = fields[pairAt[j][0]];
                    String y = fields[pairAt[j][1]];
                    if (x != null && y != null) {
                        double a = number(columns.get(pairAt[j][0]), x);
                        double b = number(columns.get(pairAt[j][1]), y);
                        if (Double.isFinite(a) && Double.isFinite(b)) {
                            joint[j].add(a, b);
                        }
                    }
                }
                rows++;
                if ((rows & 0xFFFF) == 0 && progress != null) {
                    progress.accept(rows);
                }
            }
        } catch (SQLException e) {
            throw new WaveScanner.SourceReadException("reading wave " + wave + " failed: " + e.getMessage(), e);
        }
        Map<String, ColumnTally> out = new LinkedHashMap<>();
        Map<String, Map<String, double[]>> weights = new LinkedHashMap<>();
        for (int i = 0; i < k; i++) {
            SourceColumn col = columns.get(i);
            if (bins[i] != null) {
                out.put(col.name(), new ColumnTally(col.name(), col.type(), rows, nulls[i], bins[i].counts(), false,
                        bins[i].binning()));
                if (weighted) {
                    weights.put(col.name(), bins[i].weights());
                }
                continue;
            }
            Map<String, Long> counts = new HashMap<>(tallies.get(i).size() * 2);
            tallies.get(i).forEach((v, cell) -> counts.put(v, cell[0]));
            out.put(col.name(), new ColumnTally(col.name(), col.type(), rows, nulls[i], counts, truncated[i]));
            if (weighted) {
                Map<String, double[]> ws = weightSums.get(i);
                counts.keySet().forEach(v -> ws.computeIfAbsent(v, x -> new double[2]));
                weights.put(col.name(), ws);
            }
        }
        List<JointTally> jointTallies = new ArrayList<>(pairs.size());
        for (int j = 0; j < joint.length; j++) {
            jointTallies.add(joint[j].tally(pairs.get(j).x(), pairs.get(j).y()));
        }
        return new WaveScanner.WaveScan(rows, out, weights, badWeights, null, jointTallies);
    }

    /** Moves a numeric column's exact counts into relative bins, when it has more distinct values than kept. */
    private static RelativeBins summarise(SourceColumn col, Map<String, long[]> tally, Map<String, double[]> weights) {
        RelativeBins bins = new RelativeBins(RelativeBins.DEFAULT_MAX_BINS, 0, isReal(col));
        tally.forEach((v, cell) -> {
            double[] w = weights == null ? null : weights.get(v);
            bins.add(number(col, v), cell[0], w == null ? 0 : w[0], w == null ? 0 : w[1]);
        });
        return bins;
    }

    private static boolean isReal(SourceColumn col) {
        String t = col.postgresType().toLowerCase(java.util.Locale.ROOT);
        return t.equals("real") || t.equals("float4");
    }

    /** A numeric column's text as a double; a {@code real} reads as the float it is, widened exactly. */
    private static double number(SourceColumn col, String text) {
        return isReal(col) ? Float.parseFloat(text) : Double.parseDouble(text);
    }

    static String copySql(Handle h, WaveSource source, String wave, List<SourceColumn> columns) {
        StringBuilder select = new StringBuilder("SELECT ");
        if (columns.isEmpty()) {
            select.append("1");
        }
        for (int i = 0; i < columns.size(); i++) {
            if (i > 0) {
                select.append(", ");
            }
            select.append(Identifiers.quote(columns.get(i).name()));
        }
        select.append(source.fromClause(wave));
        return "COPY (" + select + ") TO STDOUT";
    }
}
