package org.wavewarden.read;

import org.jdbi.v3.core.Handle;
import org.postgresql.PGConnection;
import org.postgresql.copy.CopyOut;
import org.wavewarden.config.Identifiers;
import org.wavewarden.profile.Binning;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.Hashes;
import org.wavewarden.profile.JointTally;
import org.wavewarden.profile.PairCounter;
import org.wavewarden.profile.RelativeBins;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;
import java.nio.charset.StandardCharsets;
import java.sql.Connection;
import java.sql.SQLException;
import java.time.LocalDate;
import java.util.Arrays;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.function.LongConsumer;

/**
 * Reads one wave in a single pass like {@link WaveScanner}, with the same result, but asks PostgreSQL for
 * {@code COPY (SELECT ...) TO STDOUT (FORMAT binary)} and tallies each cell without making a Java object for it.
 *
 * <p>Integers, {@code real}, {@code double precision}, {@code boolean} and {@code date} cells are counted in an
 * open-addressing table keyed by the value's bits; text and {@code numeric} cells in a table keyed by their bytes.
 * Each distinct value is turned into the text PostgreSQL's output function prints (what text COPY sends) once, at
 * the end. Every other type (timestamps, intervals, arrays, domains, extension types) is sent by the server as the
 * output of its own output function, {@code format('%s', column)}, and tallied as text; a plain {@code ::text} cast
 * would not do, because some types cast to text differently than they print ({@code boolean} gives
 * {@code true}, {@code inet} adds its netmask).
 *
 * <p>Floating-point text follows PostgreSQL 12 and later with {@code extra_float_digits > 0} (the JDBC driver sets
 * 3): the shortest decimal that reads back as the same value, the closest such when several have that length,
 * printed in fixed notation for decimal exponents from -4 up to 14 ({@code real}: up to 5) and as {@code 1e+20}
 * otherwise, as the server's Ryu-based {@code float8out} and {@code float4out} do (Adams 2018, "Ryu: fast
 * float-to-string conversion", PLDI). Dates follow {@code DateStyle = ISO}, which the scan sets, as
 * {@link WaveScanner} does. Numeric cells are decoded from the binary numeric layout (base-10000 digits, weight,
 * sign, display scale) the way the server's {@code numeric_out} prints them.
 */
public final class BinaryWaveScanner {

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

    /** How a column travels in the binary stream and is tallied. */
    enum Decode {
        INT2, INT4, INT8, FLOAT4, FLOAT8, BOOL, DATE, NUMERIC, TEXT, OUTPUT_TEXT;

        static Decode of(String postgresType) {
            return switch (postgresType.toLowerCase(Locale.ROOT)) {
                case "smallint", "int2" -> INT2;
                case "integer", "int4", "int" -> INT4;
                case "bigint", "int8" -> INT8;
                case "real", "float4" -> FLOAT4;
                case "double precision", "float8" -> FLOAT8;
                case "boolean", "bool" -> BOOL;
                case "date" -> DATE;
                case "numeric", "decimal" -> NUMERIC;
                case "text", "character varying", "varchar", "character", "bpchar", "name" -> TEXT;
                default -> OUTPUT_TEXT;
            };
        }

        boolean bytesKeyed() {
            return this == NUMERIC || this == TEXT || this == OUTPUT_TEXT;
        }

        boolean isNumber() {
            return this == INT2 || this == INT4 || this == INT8 || this == FLOAT4 || this == FLOAT8 || this == NUMERIC;
        }
    }

    /** The scan without weight, design or pairs. */
    public WaveScanner.WaveScan scan(Handle h, WaveSource source, String wave, List<SourceColumn> columns,
                                     LongConsumer progress) {
        return scan(h, source, wave, columns, null, null, List.of(), progress);
    }

    /** The scan with a weight column and no sampling design. */
    public WaveScanner.WaveScan scan(Handle h, WaveSource source, String wave, List<SourceColumn> columns,
                                     SourceColumn weight, LongConsumer progress) {
        return scan(h, source, wave, columns, weight, null, List.of(), progress);
    }

    /** The scan with a weight column and a sampling design, without pairs. */
    public WaveScanner.WaveScan scan(Handle h, WaveSource source, String wave, List<SourceColumn> columns,
                                     SourceColumn weight, WaveScanner.Design design, LongConsumer progress) {
        return scan(h, source, wave, columns, weight, design, List.of(), progress);
    }

    /**
     * Same contract as {@link WaveScanner#scan}: the wave's row count, one tally per requested column and, with a
     * weight column, each value's sum of weights and of squared weights; with a design, the PSU sums of
     * {@link org.wavewarden.profile.DesignSummary} (a weight that is NULL or invalid counts as zero there); with
     * pairs, one joint tally per pair, its cells decoded to doubles as they pass into one array reused for every row.
     *
     * @param design the stratum and cluster columns, or null
     * @param pairs  pairs of numeric columns among {@code columns} to tally jointly, possibly none
     */
    public WaveScanner.WaveScan scan(Handle h, WaveSource source, String wave, List<SourceColumn> columns,
                                     SourceColumn weight, WaveScanner.Design design, List<PairSpec> pairs,
                                     LongConsumer progress) {
        int k = columns.size();
        // The weight and the design travel first, so every cell of a row knows its weight and PSU.
        List<SourceColumn> read = new java.util.ArrayList<>(k + 3);
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
        int first = read.size();
        read.addAll(columns);
        Decode[] all = new Decode[read.size()];
        for (int i = 0; i < read.size(); i++) {
            all[i] = Decode.of(read.get(i).postgresType());
        }
        Decode weightDecode = weight == null ? null : all[0];
        Decode[] decode = Arrays.copyOfRange(all, first, all.length);
        LongTally[] longs = new LongTally[k];
        BytesTally[] bytes = new BytesTally[k];
        RelativeBins[] bins = new RelativeBins[k];
        for (int i = 0; i < k; i++) {
            if (decode[i].bytesKeyed()) {
                bytes[i] = new BytesTally(weight != null);
            } else {
                longs[i] = new LongTally(weight != null);
            }
        }
        long[] nulls = new long[k];
        boolean[] truncated = new boolean[k];
        boolean[] numeric = new boolean[k];
        for (int i = 0; i < k; i++) {
            numeric[i] = decode[i].isNumber();
        }
        DesignScan ds = design == null ? null : new DesignScan(numeric);
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
                st.execute("SET DateStyle = 'ISO, YMD'"); // timestamps sent as text print in one form, as in WaveScanner
            }
            copy = c.unwrap(PGConnection.class).getCopyAPI().copyOut(sql);
            BinaryStream in = new BinaryStream(copy);
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
                        w = weightValue(weightDecode, in.buf, in.pos, len);
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
                for (int i = 0; i < fields - first; i++) {
                    int len = in.int32();
                    if (i >= k) { // the placeholder column of a scan without columns
                        in.skip(Math.max(len, 0));
                        continue;
                    }
                    if (len < 0) {
                        nulls[i]++;
                        value[i] = Double.NaN;
                        continue;
                    }
                    in.need(len);
                    byte[] b = in.buf;
                    int p = in.pos;
                    // A number is decoded once, and only where a pair, the bins or the design needs it.
                    double x = numeric[i] && (inPair[i] || bins[i] != null || ds != null)
                            ? number(decode[i], b, p, len) : Double.NaN;
                    if (inPair[i]) {
                        value[i] = x;
                    }
                    if (bins[i] != null) {
                        bins[i].add(x, w);
                        if (ds != null && psu >= 0) {
                            ds.addBinned(i, psu, x, w);
                        }
                        in.pos += len;
                        continue;
                    }
                    long key = switch (decode[i]) {
                        case INT2 -> (short) (((b[p] & 0xFF) << 8) | (b[p + 1] & 0xFF));
                        case INT4, FLOAT4, DATE -> int32(b, p);
                        case INT8, FLOAT8 -> int64(b, p);
                        case BOOL -> b[p] != 0 ? 1 : 0;
                        case NUMERIC -> bytes[i].add(b, p, len, exactNumbers, w);
                        case TEXT, OUTPUT_TEXT -> len > WaveScanner.MAX_VALUE_CHARS
                                ? addLongText(bytes[i], b, p, len, w) : bytes[i].add(b, p, len, maxDistinct, w);
                    };
                    boolean kept = decode[i].bytesKeyed() ? key >= 0
                            : longs[i].add(key, numeric[i] ? exactNumbers : maxDistinct, w);
                    if (kept) {
                        if (ds != null && psu >= 0) {
                            ds.add(i, psu, key, x, w);
                        }
                    } else if (numeric[i]) {
                        if (ds != null) {
                            Decode d = decode[i];
                            LongTally lt = longs[i];
                            BytesTally bt = bytes[i];
                            ds.toBins(i, lt != null ? bits -> number(d, bits) : e -> bt.number(d, (int) e));
                        }
                        bins[i] = summarise(decode[i], longs[i], bytes[i]);
                        longs[i] = null;
                        bytes[i] = null;
                        if (Double.isNaN(x)) {
                            x = number(decode[i], b, p, len);
                        }
                        bins[i].add(x, w);
                        if (ds != null && psu >= 0) {
                            ds.addBinned(i, psu, x, w);
                        }
                    } else {
                        truncated[i] = true;
                        if (ds != null) {
                            ds.incomplete(i);
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
                rows++;
                if ((rows & 0xFFFF) == 0 && progress != null) {
                    progress.accept(rows);
                }
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
        org.wavewarden.profile.DesignSummary designSummary = null;
        if (ds != null) {
            List<java.util.function.LongFunction<String>> texts = new java.util.ArrayList<>();
            boolean[] binned = new boolean[k];
            for (int i = 0; i < k; i++) {
                Decode d = decode[i];
                BytesTally bt = bytes[i];
                binned[i] = bins[i] != null;
                texts.add(binned[i] ? null : d.bytesKeyed() ? e -> bt.text(d, (int) e) : x -> keep(text(d, x)));
            }
            designSummary = ds.result(columns.stream().map(SourceColumn::name).toList(), texts, binned);
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
            } else if (decode[i].bytesKeyed()) {
                counts = bytes[i].texts(decode[i]);
                if (weight != null) {
                    weights.put(col.name(), bytes[i].weightTexts(decode[i]));
                }
            } else {
                counts = longs[i].texts(decode[i]);
                if (weight != null) {
                    weights.put(col.name(), longs[i].weightTexts(decode[i]));
                }
            }
            longs[i] = null; // each column's table can go as soon as its text form exists
            bytes[i] = null;
            bins[i] = null;
            out.put(col.name(), new ColumnTally(col.name(), col.type(), rows, nulls[i], counts, truncated[i], binning));
        }
        List<JointTally> jointTallies = new java.util.ArrayList<>(pairs.size());
        for (int j = 0; j < joint.length; j++) {
            jointTallies.add(joint[j].tally(pairs.get(j).x(), pairs.get(j).y()));
        }
        return new WaveScanner.WaveScan(rows, out, weights, badWeights, designSummary, jointTallies);
    }

    /** A design column travels as its output text, whatever its type. */
    private static SourceColumn asText(SourceColumn c) {
        return new SourceColumn(c.name(), org.wavewarden.profile.ColumnType.OTHER, "design label");
    }

    /** Moves a numeric column's exact counts into relative bins, when it has more distinct values than kept. */
    private static RelativeBins summarise(Decode d, LongTally longs, BytesTally bytes) {
        RelativeBins bins = new RelativeBins(RelativeBins.DEFAULT_MAX_BINS, 0, d == Decode.FLOAT4);
        if (longs != null) {
            longs.forEach((key, count, w, w2) -> bins.add(number(d, key), count, w, w2));
        } else {
            bytes.forEach((b, p, len, count, w, w2) -> bins.add(number(d, b, p, len), count, w, w2));
        }
        return bins;
    }

    /** A numeric cell's value, as the server's text form would read back in Java (float4 widened exactly). */
    static double number(Decode d, byte[] b, int p, int len) {
        return switch (d) {
            case INT2 -> (short) int16(b, p);
            case INT4 -> int32(b, p);
            case INT8 -> int64(b, p);
            case FLOAT4 -> Float.intBitsToFloat(int32(b, p));
            case FLOAT8 -> Double.longBitsToDouble(int64(b, p));
            case NUMERIC -> numericValue(b, p, len);
            default -> throw new IllegalArgumentException("decode " + d + " is not a number");
        };
    }

    private static double number(Decode d, long key) {
        return switch (d) {
            case INT2, INT4, INT8 -> key;
            case FLOAT4 -> Float.intBitsToFloat((int) key);
            case FLOAT8 -> Double.longBitsToDouble(key);
            default -> throw new IllegalArgumentException("decode " + d + " is not keyed by a number");
        };
    }

    /**
     * A binary numeric as the nearest double: exact digits up to 2^53 scaled by a power of ten of at most 22 are
     * one correctly rounded operation (Clinger 1990, "How to read floating point numbers accurately", PLDI);
     * anything else goes through the text form.
     */
    static double numericValue(byte[] b, int p, int len) {
        int ndigits = int16(b, p);
        int weight = (short) int16(b, p + 2);
        int sign = int16(b, p + 4);
        if (sign == 0xC000 || sign == 0xD000 || sign == 0xF000 || ndigits > 4) {
            return Double.parseDouble(numericText(b, p, len));
        }
        long u = 0;
        for (int i = 0; i < ndigits; i++) {
            u = u * 10000 + int16(b, p + 8 + 2 * i);
        }
        int exp10 = 4 * (weight - ndigits + 1);
        double x;
        if (ndigits == 0) {
            x = 0;
        } else if (exp10 >= 0 && exp10 <= 22 && u < (1L << 53)) {
            x = u * POW10[exp10];
            if (x >= 0x1p53) {
                return Double.parseDouble(numericText(b, p, len));
            }
        } else if (exp10 < 0 && exp10 >= -22 && u < (1L << 53)) {
            x = u / POW10[-exp10];
        } else {
            return Double.parseDouble(numericText(b, p, len));
        }
        return sign == 0x4000 ? -x : x;
    }

    private static final double[] POW10 = new double[23];

    static {
        double v = 1;
        for (int i = 0; i < POW10.length; i++) {
            POW10[i] = v;
            v *= 10;
        }
    }

    /** A weight cell, or NaN when it is not a finite non-negative number (as {@link WaveScanner#weight}). */
    static double weightValue(Decode d, byte[] b, int p, int len) {
        double w = switch (d) {
            case INT2, INT4, INT8, FLOAT4, FLOAT8, NUMERIC -> number(d, b, p, len);
            default -> WaveScanner.weight(new String(b, p, len, StandardCharsets.UTF_8));
        };
        return w >= 0 && Double.isFinite(w) ? w : Double.NaN;
    }

    /** A cell that may be longer than the text scanner keeps: its stand-in is tallied, as the text scanner does. */
    private int addLongText(BytesTally t, byte[] b, int p, int len, double w) {
        String v = new String(b, p, len, StandardCharsets.UTF_8);
        if (v.length() <= WaveScanner.MAX_VALUE_CHARS) {
            return t.add(b, p, len, maxDistinct, w);
        }
        byte[] s = WaveScanner.shortened(v).getBytes(StandardCharsets.UTF_8);
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

    // ---- text forms, once per distinct value ------------------------------------------------------------------

    static String text(Decode d, long key) {
        return switch (d) {
            case INT2, INT4, INT8 -> Long.toString(key);
            case BOOL -> key != 0 ? "t" : "f";
            case DATE -> dateText((int) key);
            case FLOAT4 -> float4Text(Float.intBitsToFloat((int) key));
            case FLOAT8 -> float8Text(Double.longBitsToDouble(key));
            default -> throw new IllegalArgumentException("decode " + d + " is not keyed by a long");
        };
    }

    /** {@code date_out} under {@code DateStyle = ISO}: days since 2000-01-01, proleptic Gregorian, years BC marked. */
    static String dateText(int days) {
        if (days == Integer.MAX_VALUE) {
            return "infinity";
        }
        if (days == Integer.MIN_VALUE) {
            return "-infinity";
        }
        LocalDate d = LocalDate.of(2000, 1, 1).plusDays(days);
        int y = d.getYear();
        boolean bc = y <= 0;
        String year = Integer.toString(bc ? 1 - y : y);
        StringBuilder sb = new StringBuilder(16);
        sb.append("0".repeat(Math.max(0, 4 - year.length()))).append(year).append('-');
        two(sb, d.getMonthValue()).append('-');
        two(sb, d.getDayOfMonth());
        return bc ? sb.append(" BC").toString() : sb.toString();
    }

    private static StringBuilder two(StringBuilder sb, int v) {
        return sb.append(v < 10 ? "0" : "").append(v);
    }

    /** {@code float8out} with shortest-exact output. */
    static String float8Text(double v) {
        double a = Math.abs(v);
        return floatText(v, Math.nextDown(a), Math.ulp(a), Double.toString(a), 17, 15);
    }

    /** {@code float4out} with shortest-exact output; float to double widening is exact, so one routine serves. */
    static String float4Text(float v) {
        float a = Math.abs(v);
        return floatText(v, Math.nextDown(a), Math.ulp(a), Float.toString(a), 9, 6);
    }

    /**
     * The shortest decimal strictly between the midpoints to the neighbouring representable values, as PostgreSQL
     * prints floats; {@code nextDown} and {@code ulp} are of |v| in its own precision.
     */
    private static String floatText(double v, double nextDown, double ulp, String javaText, int maxDigits,
                                    int fixedLimit) {
        if (Double.isNaN(v)) {
            return "NaN";
        }
        if (Double.isInfinite(v)) {
            return v > 0 ? "Infinity" : "-Infinity";
        }
        if (v == 0) {
            return 1 / v < 0 ? "-0" : "0";
        }
        BigDecimal exact = new BigDecimal(Math.abs(v));
        BigDecimal low = exact.add(new BigDecimal(nextDown)).multiply(HALF);
        BigDecimal high = exact.add(new BigDecimal(ulp).multiply(HALF));
        BigDecimal s = shortest(exact, low, high, digits(javaText), maxDigits);
        return (v < 0 ? "-" : "") + layout(s, fixedLimit);
    }

    private static final BigDecimal HALF = new BigDecimal("0.5");
    private static final MathContext[] FLOOR = new MathContext[20];
    private static final MathContext[] CEILING = new MathContext[20];

    static {
        for (int p = 1; p < 20; p++) {
            FLOOR[p] = new MathContext(p, RoundingMode.FLOOR);
            CEILING[p] = new MathContext(p, RoundingMode.CEILING);
        }
    }

    /** Significant digits of Java's own shortest-ish text, the first guess of the length. */
    private static int digits(String javaText) {
        String m = javaText.substring(0, javaText.indexOf('E') < 0 ? javaText.length() : javaText.indexOf('E'));
        return Math.max(1, new BigDecimal(m).stripTrailingZeros().precision());
    }

    /**
     * The shortest decimal strictly between the midpoints to the neighbouring values, the nearest of that length.
     * The server's Ryu never takes a midpoint itself even when reading it back would round to the value, so
     * {@code 2e23} prints as {@code 1.9999999999999998e+23}. The length is searched from Java's {@code toString}
     * (Java 17's is sometimes a digit or more too long, sometimes takes a midpoint); the test is monotone because
     * every p-1 digit decimal is a p digit decimal.
     */
    private static BigDecimal shortest(BigDecimal exact, BigDecimal low, BigDecimal high, int guess, int most) {
        int p = Math.min(guess, most);
        BigDecimal best = nearest(exact, low, high, p);
        while (best == null && p < most) {
            best = nearest(exact, low, high, ++p);
        }
        if (best == null) {
            throw new IllegalStateException("no decimal of " + most + " digits reads back as " + exact);
        }
        while (p > 1) {
            BigDecimal shorter = nearest(exact, low, high, p - 1);
            if (shorter == null) {
                break;
            }
            best = shorter;
            p--;
        }
        return best.stripTrailingZeros();
    }

    /** The p-digit decimal nearest to the exact value among the two around it inside (low, high), or null. */
    private static BigDecimal nearest(BigDecimal exact, BigDecimal low, BigDecimal high, int p) {
        BigDecimal down = exact.round(FLOOR[p]);
        BigDecimal up = exact.round(CEILING[p]);
        boolean d = down.compareTo(low) > 0;
        boolean u = up.compareTo(high) < 0 && up.compareTo(down) != 0;
        if (d && u) {
            int c = exact.subtract(down).compareTo(up.subtract(exact));
            if (c != 0) {
                return c < 0 ? down : up;
            }
            return down.unscaledValue().testBit(0) ? up : down; // a tie goes to the even last digit
        }
        return d ? down : u ? up : null;
    }

    /** PostgreSQL's layout of shortest digits: fixed for exponents -4 .. fixedBelow-1, else {@code d.ddde+XX}. */
    static String layout(BigDecimal positive, int fixedBelow) {
        String digits = positive.unscaledValue().toString();
        int exp = digits.length() - 1 - positive.scale();
        StringBuilder sb = new StringBuilder(digits.length() + 8);
        if (exp >= -4 && exp < fixedBelow) {
            if (exp < 0) {
                sb.append("0.").append("0".repeat(-exp - 1)).append(digits);
            } else if (digits.length() <= exp + 1) {
                sb.append(digits).append("0".repeat(exp + 1 - digits.length()));
            } else {
                sb.append(digits, 0, exp + 1).append('.').append(digits, exp + 1, digits.length());
            }
            return sb.toString();
        }
        sb.append(digits.charAt(0));
        if (digits.length() > 1) {
            sb.append('.').append(digits, 1, digits.length());
        }
        int e = Math.abs(exp);
        sb.append('e').append(exp < 0 ? '-' : '+').append(e < 10 ? "0" : "").append(e);
        return sb.toString();
    }

    /** {@code numeric_out} of the binary numeric layout (int16 ndigits, weight, sign, dscale; base-10000 digits). */
    static String numericText(byte[] b, int p, int len) {
        if (len < 8) {
            throw new IllegalStateException("numeric cell of " + len + " bytes");
        }
        int ndigits = int16(b, p);
        int weight = (short) int16(b, p + 2);
        int sign = int16(b, p + 4);
        int dscale = int16(b, p + 6);
        switch (sign) {
            case 0xC000 -> {
                return "NaN";
            }
            case 0xD000 -> {
                return "Infinity";
            }
            case 0xF000 -> {
                return "-Infinity";
            }
            default -> {
            }
        }
        int[] dig = new int[ndigits];
        for (int i = 0; i < ndigits; i++) {
            dig[i] = int16(b, p + 8 + 2 * i);
        }
        StringBuilder sb = new StringBuilder(4 * (Math.max(weight, 0) + 1) + dscale + 2);
        if (sign == 0x4000) {
            sb.append('-');
        }
        if (weight < 0) {
            sb.append('0');
        } else {
            for (int d = 0; d <= weight; d++) {
                int v = d < ndigits ? dig[d] : 0;
                if (d == 0) {
                    sb.append(v);
                } else {
                    four(sb, v);
                }
            }
        }
        if (dscale > 0) {
            sb.append('.');
            int start = sb.length();
            for (int d = weight + 1; sb.length() - start < dscale; d++) {
                four(sb, d >= 0 && d < ndigits ? dig[d] : 0);
            }
            sb.setLength(start + dscale);
        }
        return sb.toString();
    }

    private static void four(StringBuilder sb, int v) {
        if (v < 1000) {
            sb.append('0');
        }
        if (v < 100) {
            sb.append('0');
        }
        if (v < 10) {
            sb.append('0');
        }
        sb.append(v);
    }

    static int int16(byte[] b, int p) {
        return ((b[p] & 0xFF) << 8) | (b[p + 1] & 0xFF);
    }

    static int int32(byte[] b, int p) {
        return ((b[p] & 0xFF) << 24) | ((b[p + 1] & 0xFF) << 16) | ((b[p + 2] & 0xFF) << 8) | (b[p + 3] & 0xFF);
    }

    static long int64(byte[] b, int p) {
        return ((long) int32(b, p) << 32) | (int32(b, p + 4) & 0xFFFFFFFFL);
    }

    private static Map<String, Long> merged(int expected) {
        return new HashMap<>(Math.max(16, expected * 2));
    }

    private static String keep(String v) {
        return v.length() > WaveScanner.MAX_VALUE_CHARS ? WaveScanner.shortened(v) : v;
    }

    // ---- tallies without an object per cell ----------------------------------------------------------------------

    /**
     * Counts per distinct 64-bit key, open addressing with linear probing; a count of zero marks an empty slot.
     * With weights, each slot also sums its cells' weights and squared weights.
     */
    static final class LongTally {
        private final boolean weighted;
        private long[] keys = new long[64];
        private long[] counts = new long[64];
        private double[] wsum;
        private double[] wsq;
        private int size;

        LongTally(boolean weighted) {
            this.weighted = weighted;
            if (weighted) {
                wsum = new double[64];
                wsq = new double[64];
            }
        }

        /** Counts one cell of weight w (NaN: none); false when the value is new and {@code max} are held. */
        boolean add(long key, int max, double w) {
            int mask = keys.length - 1;
            int i = Hashes.mix(key) & mask;
            while (counts[i] != 0) {
                if (keys[i] == key) {
                    counts[i]++;
                    weigh(i, w);
                    return true;
                }
                i = (i + 1) & mask;
            }
            if (size >= max) {
                return false;
            }
            keys[i] = key;
            counts[i] = 1;
            weigh(i, w);
            if (++size * 2 > keys.length) {
                grow();
            }
            return true;
        }

        private void weigh(int i, double w) {
            if (weighted && !Double.isNaN(w)) {
                wsum[i] += w;
                wsq[i] += w * w;
            }
        }

        int size() {
            return size;
        }

        private void grow() {
            long[] ok = keys;
            long[] oc = counts;
            double[] ow = wsum;
            double[] ow2 = wsq;
            keys = new long[ok.length * 2];
            counts = new long[ok.length * 2];
            if (weighted) {
                wsum = new double[ok.length * 2];
                wsq = new double[ok.length * 2];
            }
            int mask = keys.length - 1;
            for (int j = 0; j < ok.length; j++) {
                if (oc[j] != 0) {
                    int i = Hashes.mix(ok[j]) & mask;
                    while (counts[i] != 0) {
                        i = (i + 1) & mask;
                    }
                    keys[i] = ok[j];
                    counts[i] = oc[j];
                    if (weighted) {
                        wsum[i] = ow[j];
                        wsq[i] = ow2[j];
                    }
                }
            }
        }

        interface Slot {
            void accept(long key, long count, double sumW, double sumW2);
        }

        void forEach(Slot s) {
            for (int j = 0; j < keys.length; j++) {
                if (counts[j] != 0) {
                    s.accept(keys[j], counts[j], weighted ? wsum[j] : 0, weighted ? wsq[j] : 0);
                }
            }
        }

        Map<String, Long> texts(Decode d) {
            Map<String, Long> out = merged(size);
            forEach((key, count, w, w2) -> out.merge(keep(text(d, key)), count, Long::sum));
            return out;
        }

        Map<String, double[]> weightTexts(Decode d) {
            Map<String, double[]> out = new HashMap<>(Math.max(16, size * 2));
            forEach((key, count, w, w2) -> addWeights(out, keep(text(d, key)), w, w2));
            return out;
        }
    }

    private static void addWeights(Map<String, double[]> out, String text, double w, double w2) {
        double[] cell = out.computeIfAbsent(text, x -> new double[2]);
        cell[0] += w;
        cell[1] += w2;
    }

    /** Counts per distinct byte string: the bytes live once in an arena, slots hold entry numbers. */
    static final class BytesTally {
        private final boolean weighted;
        private byte[] arena = new byte[1024];
        private int used;
        private int[] offset = new int[32];
        private int[] length = new int[32];
        private int[] hash = new int[32];
        private long[] count = new long[32];
        private double[] wsum;
        private double[] wsq;
        private int size;
        private int[] slots = new int[64]; // entry number + 1; 0 is empty

        BytesTally(boolean weighted) {
            this.weighted = weighted;
            if (weighted) {
                wsum = new double[32];
                wsq = new double[32];
            }
        }

        /** Counts one cell; its entry number, or -1 when the value is new and {@code max} are held. */
        int add(byte[] b, int p, int len, int max, double w) {
            int h = hash(b, p, len);
            int mask = slots.length - 1;
            int i = h & mask;
            int e;
            while ((e = slots[i]) != 0) {
                e--;
                if (hash[e] == h && length[e] == len
                        && Arrays.equals(arena, offset[e], offset[e] + len, b, p, p + len)) {
                    count[e]++;
                    weigh(e, w);
                    return e;
                }
                i = (i + 1) & mask;
            }
            if (size >= max) {
                return -1;
            }
            if (size == count.length) {
                int n = size * 2;
                offset = Arrays.copyOf(offset, n);
                length = Arrays.copyOf(length, n);
                hash = Arrays.copyOf(hash, n);
                count = Arrays.copyOf(count, n);
                if (weighted) {
                    wsum = Arrays.copyOf(wsum, n);
                    wsq = Arrays.copyOf(wsq, n);
                }
            }
            if (used + len > arena.length) {
                arena = Arrays.copyOf(arena, Math.max(arena.length * 2, used + len));
            }
            System.arraycopy(b, p, arena, used, len);
            offset[size] = used;
            length[size] = len;
            hash[size] = h;
            count[size] = 1;
            weigh(size, w);
            used += len;
            slots[i] = ++size;
            if (size * 2 > slots.length) {
                rehash();
            }
            return size - 1;
        }

        private void weigh(int e, double w) {
            if (weighted && !Double.isNaN(w)) {
                wsum[e] += w;
                wsq[e] += w * w;
            }
        }

        int size() {
            return size;
        }

        private static int hash(byte[] b, int p, int len) {
            int h = 0x811C9DC5 ^ len;
            for (int j = p; j < p + len; j++) {
                h = (h ^ b[j]) * 0x01000193;
            }
            return h ^ (h >>> 16);
        }

        private void rehash() {
            slots = new int[slots.length * 2];
            int mask = slots.length - 1;
            for (int e = 0; e < size; e++) {
                int i = hash[e] & mask;
                while (slots[i] != 0) {
                    i = (i + 1) & mask;
                }
                slots[i] = e + 1;
            }
        }

        interface Entry {
            void accept(byte[] arena, int offset, int length, long count, double sumW, double sumW2);
        }

        void forEach(Entry x) {
            for (int e = 0; e < size; e++) {
                x.accept(arena, offset[e], length[e], count[e], weighted ? wsum[e] : 0, weighted ? wsq[e] : 0);
            }
        }

        double number(Decode d, int e) {
            return BinaryWaveScanner.number(d, arena, offset[e], length[e]);
        }

        String text(Decode d, int e) {
            // A numeric keeps its full text however long (-1e-300 takes 303 characters): a stand-in is no number.
            return d == Decode.NUMERIC ? numericText(arena, offset[e], length[e])
                    : new String(arena, offset[e], length[e], StandardCharsets.UTF_8);
        }

        Map<String, Long> texts(Decode d) {
            Map<String, Long> out = merged(size);
            for (int e = 0; e < size; e++) {
                out.merge(text(d, e), count[e], Long::sum);
            }
            return out;
        }

        Map<String, double[]> weightTexts(Decode d) {
            Map<String, double[]> out = new HashMap<>(Math.max(16, size * 2));
            for (int e = 0; e < size; e++) {
                addWeights(out, text(d, e), wsum[e], wsq[e]);
            }
            return out;
        }
    }

    /**
     * The COPY binary stream over the driver's messages. A message is usually one row, so fields are read in place;
     * a field that spans messages is gathered into one array first.
     */
    static final class BinaryStream {
        private static final byte[] SIGNATURE = {'P', 'G', 'C', 'O', 'P', 'Y', '\n', (byte) 0xFF, '\r', '\n', 0};
        private final CopyOut copy;
        byte[] buf = new byte[0];
        int pos;

        BinaryStream(CopyOut copy) {
            this.copy = copy;
        }

        void header() throws SQLException {
            need(SIGNATURE.length + 8);
            if (!Arrays.equals(buf, pos, pos + SIGNATURE.length, SIGNATURE, 0, SIGNATURE.length)) {
                throw new IllegalStateException("the server did not send a COPY binary header");
            }
            pos += SIGNATURE.length + 4; // flags: no OIDs in COPY of a query
            int extension = int32();
            skip(extension);
        }

        int int16() throws SQLException {
            need(2);
            int v = (short) BinaryWaveScanner.int16(buf, pos);
            pos += 2;
            return v;
        }

        int int32() throws SQLException {
            need(4);
            int v = BinaryWaveScanner.int32(buf, pos);
            pos += 4;
            return v;
        }

        /** A text field (length-prefixed), or null for NULL. */
        String text() throws SQLException {
            int len = int32();
            if (len < 0) {
                return null;
            }
            need(len);
            String t = new String(buf, pos, len, StandardCharsets.UTF_8);
            pos += len;
            return t;
        }

        void skip(int n) throws SQLException {
            need(n);
            pos += n;
        }

        /** Makes n bytes available from {@code pos}, fetching messages as needed. */
        void need(int n) throws SQLException {
            while (buf.length - pos < n) {
                byte[] next = copy.readFromCopy();
                if (next == null) {
                    throw new IllegalStateException("the COPY stream ended inside a row");
                }
                int rest = buf.length - pos;
                if (rest == 0) {
                    buf = next;
                } else {
                    byte[] joined = new byte[rest + next.length];
                    System.arraycopy(buf, pos, joined, 0, rest);
                    System.arraycopy(next, 0, joined, rest, next.length);
                    buf = joined;
                }
                pos = 0;
            }
        }
    }
}
