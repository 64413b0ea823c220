package org.wavewarden.read;

import org.jdbi.v3.core.Handle;
import org.postgresql.PGConnection;
import org.postgresql.copy.CopyOut;
import org.wavewarden.config.Identifiers;
import org.wavewarden.profile.Binning;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.DesignSummary;
import org.wavewarden.profile.DomainTally;
import org.wavewarden.profile.JointTally;
import org.wavewarden.profile.PairCounter;
import org.wavewarden.profile.RelativeBins;

import java.nio.charset.StandardCharsets;
import java.sql.Connection;
import java.sql.SQLException;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.function.LongConsumer;
import java.util.function.LongFunction;

/**
 * Reads one wave in a single pass: asks PostgreSQL for {@code COPY (SELECT ...) TO STDOUT (FORMAT binary)}
 * ({@link CopyBinaryStream}) and tallies each cell without making a Java object for it, with the result the text
 * {@code COPY} would give.
 *
 * <p>Integers, {@code real}, {@code double precision}, {@code boolean} and {@code date} cells are counted keyed by
 * the value's bits, text and {@code numeric} cells keyed by their bytes ({@link Decode}, {@link ValueTally}). Each
 * distinct value is turned into the text PostgreSQL's output function prints (what text COPY sends) once, at the end
 * ({@link ValueText}). Every other type (timestamps, intervals, arrays, domains, extension types) is sent by the
 * server as the output of its own output function, {@code format('%s', column)}, and tallied as text; a plain
 * {@code ::text} cast would not do, because some types cast to text differently than they print ({@code boolean}
 * gives {@code true}, {@code inet} adds its netmask).
 */
public final class BinaryWaveScanner implements WaveScanner {

    private final int maxDistinct;
    private final int exactNumbers;

    public BinaryWaveScanner(int maxDistinct) {
        this(maxDistinct, WaveScanner.DEFAULT_EXACT_NUMBERS);
    }

    /**
     * @param maxDistinct  distinct values kept per non-numeric column; beyond it the tally is marked truncated
     * @param exactNumbers distinct values a numeric column is counted exactly up to; beyond it the column is
     *                     summarised in {@link RelativeBins}
     */
    public BinaryWaveScanner(int maxDistinct, int exactNumbers) {
        if (maxDistinct < 1 || exactNumbers < 1) {
            throw new IllegalArgumentException("maxDistinct and exactNumbers must be positive, were " + maxDistinct
                    + " and " + exactNumbers);
        }
        this.maxDistinct = maxDistinct;
        this.exactNumbers = exactNumbers;
    }

    /**
     * With a design, the PSU sums of {@link DesignSummary} (a weight that is NULL or invalid counts as zero there);
     * with pairs, one joint tally per pair, its cells decoded to doubles as they pass into one array reused for
     * every row. With breakdown columns, their domains are tallied in the same pass ({@link DomainScan}): each
     * breakdown column travels as its output text, after the design and before the monitored columns, so every cell
     * of a row knows its domains; a numeric column is summarised per domain beyond a 50th of the whole wave's
     * budget of exact numbers ({@link #domainExactNumbers()}).
     */
    @Override
    public WaveScanner.WaveScan scan(Handle h, WaveSource source, String wave, List<SourceColumn> columns,
                                     SourceColumn weight, WaveScanner.Design design, List<PairSpec> pairs,
                                     WaveScanner.Domains domains, LongConsumer progress) {
        int k = columns.size();
        List<SourceColumn> breakdowns = domains == null ? List.of() : domains.columns();
        int m = breakdowns.size();
        // The weight, the design and the breakdowns travel first, so every cell of a row knows its weight, PSU and
        // domains.
        List<SourceColumn> read = new ArrayList<>(k + 3 + m);
        if (weight != null) {
            read.add(weight);
        }
        boolean hasStrata = design != null && design.strata() != null;
        if (hasStrata) {
            read.add(asText(design.strata()));
        }
        if (design != null) {
            read.add(asText(design.clusters()));
        }
        for (SourceColumn b : breakdowns) {
            read.add(asText(b));
        }
        int first = read.size();
        read.addAll(columns);
        Decode[] all = new Decode[read.size()];
        for (int i = 0; i < read.size(); i++) {
            all[i] = Decode.of(read.get(i).postgresType());
        }
        Decode weightDecode = weight == null ? null : all[0];
        Decode[] decode = Arrays.copyOfRange(all, first, all.length);
        ValueTally[] tallies = new ValueTally[k];
        RelativeBins[] bins = new RelativeBins[k];
        long[] nulls = new long[k];
        boolean[] truncated = new boolean[k];
        boolean[] numeric = new boolean[k];
        for (int i = 0; i < k; i++) {
            tallies[i] = new ValueTally(decode[i], weight != null);
            numeric[i] = decode[i].isNumber();
        }
        DesignScan ds = design == null ? null : new DesignScan(numeric);
        boolean[] single = new boolean[k];
        for (int i = 0; i < k; i++) {
            single[i] = decode[i] == Decode.FLOAT4;
        }
        DomainScan[] dom = new DomainScan[m];
        for (int j = 0; j < m; j++) {
            dom[j] = new DomainScan(breakdowns.get(j).name(), domains.maxDomains(), domainExactNumbers(), numeric,
                    single, weight != null, design != null, tallies);
        }
        DomainRows held = m == 0 ? null : new DomainRows(dom, numeric, DomainRows.rowsFor(k));
        int[][] pairAt = new int[pairs.size()][];
        PairCounter[] joint = new PairCounter[pairs.size()];
        boolean[] inPair = new boolean[k];
        for (int j = 0; j < pairs.size(); j++) {
            pairAt[j] = pairs.get(j).indexIn(columns);
            joint[j] = new PairCounter();
            inPair[pairAt[j][0]] = true;
            inPair[pairAt[j][1]] = true;
        }
        double[] value = new double[k]; // this row's number in each column of a pair; NaN for NULL
        long rows = 0;
        long badWeights = 0;
        String sql = copySql(source, wave, read, all);
        CopyOut copy = null;
        boolean finished = false;
        try {
            Connection c = h.getConnection();
            try (var st = c.createStatement()) {
                st.execute("SET DateStyle = 'ISO, YMD'"); // timestamps sent as text print in one form
            }
            copy = c.unwrap(PGConnection.class).getCopyAPI().copyOut(sql);
            CopyBinaryStream in = new CopyBinaryStream(copy::readFromCopy);
            in.header();
            int expected = Math.max(k + first, 1);
            while (true) {
                int fields = in.int16();
                if (fields == -1) {
                    break;
                }
                if (fields != expected) {
                    throw new IllegalStateException("COPY row had " + fields + " fields, expected " + expected);
                }
                double w = Double.NaN;
                if (weight != null) {
                    int len = in.int32();
                    if (len >= 0) {
                        in.need(len);
                        w = weightDecode.weight(in.buf, in.pos, len);
                        in.pos += len;
                    }
                    if (Double.isNaN(w)) {
                        badWeights++;
                    }
                }
                int psu = -1;
                if (ds != null) {
                    String stratum = hasStrata ? in.text() : "";
                    psu = ds.psu(stratum, in.text());
                }
                if (held != null) {
                    held.row(w, psu);
                }
                for (int j = 0; j < m; j++) {
                    int len = in.int32();
                    if (len >= 0) {
                        in.need(len);
                    }
                    held.domain(j, dom[j].domain(in.buf, in.pos, len));
                    in.pos += Math.max(len, 0);
                }
                for (int i = 0; i < fields - first; i++) {
                    int len = in.int32();
                    if (i >= k) { // the placeholder column of a scan without columns
                        in.skip(Math.max(len, 0));
                        continue;
                    }
                    if (len < 0) {
                        nulls[i]++;
                        value[i] = Double.NaN;
                        if (held != null) {
                            held.cell(i, DomainRows.NULL, Double.NaN, 0, false);
                        }
                        continue;
                    }
                    in.need(len);
                    byte[] b = in.buf;
                    int p = in.pos;
                    Decode d = decode[i];
                    // A number is decoded once, and only where a pair, the bins or the design needs it.
                    double x = numeric[i] && (inPair[i] || bins[i] != null || ds != null || m > 0)
                            ? d.number(b, p, len) : Double.NaN;
                    if (inPair[i]) {
                        value[i] = x;
                    }
                    if (bins[i] != null) {
                        // The value's bin is worked out once, for the whole wave and every domain of the row.
                        long fine = RelativeBins.fineKey(x);
                        bins[i].add(x, fine, w);
                        if (ds != null && psu >= 0) {
                            ds.addBinned(i, psu, x, w);
                        }
                        if (held != null) {
                            held.cell(i, DomainRows.NUMBER, x, fine, true);
                        }
                        in.pos += len;
                        continue;
                    }
                    int entry = switch (d) {
                        case NUMERIC -> tallies[i].add(b, p, len, exactNumbers, w);
                        case TEXT, OUTPUT_TEXT -> len > WaveScanner.MAX_VALUE_CHARS
                                ? addLongText(tallies[i], b, p, len, w) : tallies[i].add(b, p, len, maxDistinct, w);
                        default -> tallies[i].add(d.key(b, p), numeric[i] ? exactNumbers : maxDistinct, w);
                    };
                    if (entry >= 0) {
                        if (ds != null && psu >= 0) {
                            ds.add(i, psu, entry, x, w);
                        }
                        if (held != null) { // the bin key is worked out when a domain in bins needs it
                            held.cell(i, entry, x, 0, false);
                        }
                    } else if (numeric[i]) {
                        ValueTally t = tallies[i];
                        if (ds != null) {
                            ds.toBins(i, e -> t.number((int) e));
                        }
                        if (held != null) {
                            held.flush(); // the domains take the rows so far with the column's exact entries
                        }
                        for (int j = 0; j < m; j++) {
                            dom[j].toBins(i, e -> t.number((int) e));
                        }
                        bins[i] = summarise(t, d == Decode.FLOAT4);
                        tallies[i] = null;
                        if (Double.isNaN(x)) {
                            x = d.number(b, p, len);
                        }
                        long fine = RelativeBins.fineKey(x);
                        bins[i].add(x, fine, w);
                        if (ds != null && psu >= 0) {
                            ds.addBinned(i, psu, x, w);
                        }
                        if (held != null) {
                            held.cell(i, DomainRows.NUMBER, x, fine, true);
                        }
                    } else {
                        truncated[i] = true;
                        if (ds != null) {
                            ds.incomplete(i);
                        }
                        if (held != null) {
                            held.cell(i, DomainRows.TRUNCATED, x, 0, false);
                        }
                    }
                    in.pos += len;
                }
                for (int j = 0; j < joint.length; j++) {
                    double x = value[pairAt[j][0]];
                    double y = value[pairAt[j][1]];
                    if (Double.isFinite(x) && Double.isFinite(y)) {
                        joint[j].add(x, y);
                    }
                }
                if (held != null) {
                    held.endRow();
                }
                rows++;
                if ((rows & 0xFFFF) == 0 && progress != null) {
                    progress.accept(rows);
                }
            }
            if (held != null) {
                held.flush();
            }
            while (copy.readFromCopy() != null) {
                // the trailer came; reading on to the end completes the COPY so the connection is usable again
            }
            finished = true;
        } catch (SQLException e) {
            throw new WaveScanner.SourceReadException("reading wave " + wave + " failed: " + e.getMessage(), e);
        } finally {
            if (!finished && copy != null && copy.isActive()) {
                try {
                    copy.cancelCopy();
                } catch (SQLException ignored) {
                    // the connection is returned to the pool and validated there
                }
            }
        }
        DesignSummary designSummary = null;
        List<LongFunction<String>> texts = new ArrayList<>();
        boolean[] binned = new boolean[k];
        for (int i = 0; i < k; i++) {
            ValueTally t = tallies[i];
            binned[i] = bins[i] != null;
            texts.add(binned[i] ? null : e -> t.text((int) e));
        }
        if (ds != null) {
            designSummary = ds.result(columns.stream().map(SourceColumn::name).toList(), texts, binned);
        }
        List<DomainTally> domainTallies = new ArrayList<>(m);
        for (int j = 0; j < m; j++) {
            domainTallies.add(dom[j].result(columns, texts, designSummary == null ? 0 : designSummary.psuCount()));
            dom[j] = null;
        }
        Map<String, ColumnTally> out = new LinkedHashMap<>();
        Map<String, Map<String, double[]>> weights = new LinkedHashMap<>();
        for (int i = 0; i < k; i++) {
            SourceColumn col = columns.get(i);
            Map<String, Long> counts;
            Binning binning = Binning.EXACT;
            if (bins[i] != null) {
                counts = bins[i].counts();
                binning = bins[i].binning();
                if (weight != null) {
                    weights.put(col.name(), bins[i].weights());
                }
            } else {
                counts = tallies[i].counts();
                if (weight != null) {
                    weights.put(col.name(), tallies[i].weights());
                }
            }
            tallies[i] = null; // each column's table can go as soon as its text form exists
            bins[i] = null;
            out.put(col.name(), new ColumnTally(col.name(), col.type(), rows, nulls[i], counts, truncated[i], binning));
        }
        List<JointTally> jointTallies = new ArrayList<>(pairs.size());
        for (int j = 0; j < joint.length; j++) {
            jointTallies.add(joint[j].tally(pairs.get(j).x(), pairs.get(j).y()));
        }
        return new WaveScanner.WaveScan(rows, out, weights, badWeights, designSummary, jointTallies, domainTallies);
    }

    /**
     * Distinct values a domain's numeric column is counted exactly up to: a 50th of the whole wave's budget (200 by
     * default, at least 64), since a domain holds a fraction of the rows and hundreds of domains share the memory;
     * coded answers, ages and scales stay exact within a domain, measurements and amounts go to bins.
     */
    int domainExactNumbers() {
        return Math.max(64, exactNumbers / 50);
    }

    /** A design column travels as its output text, whatever its type. */
    private static SourceColumn asText(SourceColumn c) {
        return new SourceColumn(c.name(), org.wavewarden.profile.ColumnType.OTHER, "design label");
    }

    /** Moves a numeric column's exact counts into relative bins, when it has more distinct values than kept. */
    private static RelativeBins summarise(ValueTally tally, boolean singlePrecision) {
        RelativeBins bins = new RelativeBins(RelativeBins.DEFAULT_MAX_BINS, 0, singlePrecision);
        tally.forEach((e, count, w, w2) -> bins.add(tally.number(e), count, w, w2));
        return bins;
    }

    /** A cell that may be longer than a value is kept: its stand-in is tallied ({@link ValueText#kept}). */
    private int addLongText(ValueTally t, byte[] b, int p, int len, double w) {
        String v = new String(b, p, len, StandardCharsets.UTF_8);
        if (v.length() <= WaveScanner.MAX_VALUE_CHARS) {
            return t.add(b, p, len, maxDistinct, w);
        }
        byte[] s = ValueText.shortened(v).getBytes(StandardCharsets.UTF_8);
        return t.add(s, 0, s.length, maxDistinct, w);
    }

    static String copySql(WaveSource source, String wave, List<SourceColumn> columns, Decode[] decode) {
        StringBuilder select = new StringBuilder("SELECT ");
        if (columns.isEmpty()) {
            select.append("1");
        }
        for (int i = 0; i < columns.size(); i++) {
            if (i > 0) {
                select.append(", ");
            }
            String q = Identifiers.quote(columns.get(i).name());
            if (decode[i] == Decode.OUTPUT_TEXT) {
                // num_nulls tests the cell itself; IS NULL would call a row of NULL fields NULL.
                select.append("CASE WHEN num_nulls(").append(q).append(") = 1 THEN NULL ELSE format('%s', ")
                        .append(q).append(") END");
            } else {
                select.append(q);
            }
        }
        select.append(source.fromClause(wave));
        return "COPY (" + select + ") TO STDOUT (FORMAT binary)";
    }
}
