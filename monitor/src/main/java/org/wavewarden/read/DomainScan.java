package org.wavewarden.read;

import org.wavewarden.profile.Binning;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.profile.DesignSummary;
import org.wavewarden.profile.DomainTally;
import org.wavewarden.profile.RelativeBins;
import org.wavewarden.profile.ValueIndex;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.function.LongFunction;
import java.util.function.LongToDoubleFunction;

/**
 * Accumulates, during the one pass of {@link BinaryWaveScanner}, one breakdown column's domains
 * ({@link DomainTally}): each row's domain is looked up once from the bytes of the column's output text, and every
 * monitored cell of the row is counted in its domain, with no object per cell.
 *
 * <p>A cell's value is keyed by its entry in the whole wave's {@link ValueTally} (so a value is decoded and held once,
 * however many domains it occurs in). Per monitored column, the first {@link #DENSE_ENTRIES} entries are counted in
 * plain arrays indexed by (domain, entry), and one {@link ValueIndex} numbers the (domain, value) pairs of later
 * entries, whose counts and weight sums sit in plain arrays too. A numeric column is summarised per domain in
 * {@link RelativeBins} of {@link #DOMAIN_MAX_BINS} once the domain holds more than the scan's per-domain budget of
 * distinct values, and every domain is summarised as soon as the whole wave's column is (its value entries are then
 * gone); code-like numbers stay exact, as {@link RelativeBins} keeps them. The entries of domains summarised since
 * are dropped once they outnumber the rest, and a value's bin is worked out once per cell for the whole wave and all
 * its domains ({@link RelativeBins#fineKey}). Every walk over a column's entries meets the kept ones in the order
 * they came, so dropping entries changes no floating-point sum: the tallies are bit for bit those of keeping all.
 *
 * <p>With a design, per column the weight of each (domain, PSU, value) cell and, for numbers, the sums w, w y and
 * w y^2 of each (domain, PSU) are kept, the PSUs being the whole wave's; a domain's sums are zero in PSUs where it
 * has no rows.
 *
 * <p>Memory per breakdown column and monitored column: at most {@code maxDomains} x (the per-domain budget of
 * distinct values, about 64 bytes each, or {@link #DOMAIN_MAX_BINS} bins) counting cells, plus at most {@link #MAX_CELLS} (domain, PSU,
 * value) cells (beyond it only code-like numbers get new cells, and the column's domains are reported with
 * {@link DesignSummary.ColumnDesign#complete()} false), plus 3 x domains x PSUs numeric sums. Overflow domain labels
 * are counted up to {@link #MAX_OVERFLOW_LABELS} distinct ones.
 */
final class DomainScan {

    /**
     * (domain, PSU, value) cells kept per monitored column, during the scan and in the summary's dense per-PSU arrays
     * together: four times a whole wave's {@link DesignScan#MAX_CELLS}, since it is shared by every domain.
     */
    static final int MAX_CELLS = 4 * DesignScan.MAX_CELLS;

    /** Distinct overflow labels counted; beyond it {@link DomainTally#overflowDomains()} is a lower bound. */
    static final int MAX_OVERFLOW_LABELS = 100_000;

    /**
     * Bins of a domain's summarised numeric column: a 32nd of a whole wave's (about 10 kB each), because a domain
     * holds a fraction of the rows and hundreds of domains times dozens of columns share the memory; the bins'
     * error bound is stated in the domain's {@link ColumnTally#binning()}.
     */
    static final int DOMAIN_MAX_BINS = RelativeBins.DEFAULT_MAX_BINS / 32;

    /**
     * Whole-wave value entries counted per domain in plain arrays indexed by (domain, entry) rather than in a hash
     * table: the first 128 distinct values of a column, which for coded answers, ages, dates and short scales are all
     * of them. A hash lookup per cell and domain missed the cache and cost about ten plain scans with 300
     * interviewers; an array slot is one load. At most maxDomains x 128 slots per monitored column (512 kB for 500
     * domains, three times that with weights); the later entries of a wide column go to the hash table as before.
     */
    static final int DENSE_ENTRIES = 128;

    private final String column;
    private final int maxDomains;
    private final int exactNumbers;
    private final boolean weighted;
    private final boolean designed;
    private final ValueTally[] wave; // the scanner's tallies: a value's entry there is its key here
    private final ValueIndex labels = ValueIndex.ofBytes();
    private final ValueIndex overflowLabels = ValueIndex.ofBytes();
    private long[] rows = new long[16];
    private long nullRows;
    private long overflowRows;
    private final Col[] cols;

    /**
     * @param column       the breakdown column's name
     * @param maxDomains   domains kept, in order of first appearance
     * @param exactNumbers distinct values a domain's numeric column is counted exactly up to
     * @param numeric      per monitored column, whether it is numeric
     * @param single       per monitored column, whether it is {@code real} (bins print exact values as floats)
     * @param wave         the scanner's whole-wave tallies, read to decode a value entry when a domain moves to bins
     */
    DomainScan(String column, int maxDomains, int exactNumbers, boolean[] numeric, boolean[] single, boolean weighted,
               boolean designed, ValueTally[] wave) {
        this.column = column;
        this.maxDomains = maxDomains;
        this.exactNumbers = exactNumbers;
        this.weighted = weighted;
        this.designed = designed;
        this.wave = wave;
        cols = new Col[numeric.length];
        for (int i = 0; i < numeric.length; i++) {
            cols[i] = new Col(numeric[i], single[i]);
        }
    }

    /**
     * The domain of a row from its breakdown cell {@code b[p .. p+len)} ({@code len < 0}: NULL), counting the row;
     * -1 when the cell is NULL or its domain is beyond the cap.
     */
    int domain(byte[] b, int p, int len) {
        if (len < 0) {
            nullRows++;
            return -1;
        }
        if (len > WaveScanner.MAX_VALUE_CHARS) { // a label longer than a kept value: its stand-in, as tallies keep it
            String v = new String(b, p, len, StandardCharsets.UTF_8);
            if (v.length() > WaveScanner.MAX_VALUE_CHARS) {
                b = ValueText.shortened(v).getBytes(StandardCharsets.UTF_8);
                p = 0;
                len = b.length;
            }
        }
        int d = labels.add(b, p, len, maxDomains);
        if (d < 0) {
            overflowRows++;
            overflowLabels.add(b, p, len, MAX_OVERFLOW_LABELS);
            return -1;
        }
        if (d == rows.length) {
            rows = Arrays.copyOf(rows, rows.length * 2);
        }
        rows[d]++;
        return d;
    }

    /** Column i is NULL in a row of domain d. */
    void nullCell(int i, int d) {
        Col c = cols[i];
        c.grow(d);
        c.nulls[d]++;
    }

    /**
     * Whether some domain of column i is summarised in bins, so that a cell of it needs its
     * {@link RelativeBins#fineKey} (worked out once per cell, not once per domain).
     */
    boolean binsIn(int i) {
        return cols[i].anyBins;
    }

    /**
     * A cell of column i in domain d whose value is entry {@code entry} of the whole wave's exact tally;
     * {@code fineKey} is the value's {@link RelativeBins#fineKey} when {@link #binsIn} said so, else unread.
     */
    void add(int i, int d, int psu, int entry, double x, long fineKey, double w) {
        Col c = cols[i];
        c.grow(d);
        boolean binned = c.bins[d] != null;
        if (binned) {
            c.bins[d].add(x, fineKey, w);
        } else if (entry < DENSE_ENTRIES) {
            int k = c.slot(d, entry);
            if (c.dcount[k] == 0) {
                if (!c.numeric && c.distinct[d] >= exactNumbers) {
                    truncated(i, d, psu, w); // as below: a value new beyond the domain's budget
                    return;
                }
                c.distinct[d]++;
            }
            c.dcount[k]++;
            if (weighted && !Double.isNaN(w)) {
                c.dwsum[k] += w;
                c.dwsq[k] += w * w;
            }
            if (c.numeric && c.distinct[d] > exactNumbers) {
                ValueTally t = wave[i];
                c.summariseOne(d, key -> t.number((int) key));
                binned = true;
            }
        } else {
            long cell = Col.key(d, entry);
            int e;
            if (!c.numeric && c.distinct[d] >= exactNumbers) {
                // A domain's text column keeps at most the per-domain budget of distinct values (numbers go to bins
                // instead): a value new beyond it is counted in no domain, which is then marked truncated, as a
                // whole wave's text column is beyond its own cap.
                e = c.values.find(cell);
                if (e < 0) {
                    truncated(i, d, psu, w);
                    return;
                }
            } else {
                int before = c.values.size();
                e = c.values.add(cell);
                if (e == before) {
                    c.distinct[d]++;
                    c.link(d, e);
                }
            }
            c.count(e, w);
            if (c.numeric && c.distinct[d] > exactNumbers) {
                ValueTally t = wave[i];
                c.summariseOne(d, key -> t.number((int) key));
                binned = true;
            }
        }
        if (designed && psu >= 0) {
            c.design(d, psu, entry, x, w, !binned || RelativeBins.isCodeLike(x));
        }
    }

    /** A cell of column i in domain d whose value the whole wave could not keep (a truncated text column). */
    void truncated(int i, int d, int psu, double w) {
        Col c = cols[i];
        c.grow(d);
        c.truncated[d] = true;
        if (designed && psu >= 0) {
            c.design(d, psu, 0, Double.NaN, w, false);
        }
    }

    /**
     * A cell of numeric column i in domain d after the whole wave's column moved to bins; {@code fineKey} is the
     * value's {@link RelativeBins#fineKey}.
     */
    void addNumber(int i, int d, int psu, double x, long fineKey, double w) {
        Col c = cols[i];
        c.grow(d);
        if (c.bins[d] == null) {
            c.bins[d] = c.newBins();
        }
        c.bins[d].add(x, fineKey, w);
        if (designed && psu >= 0) {
            c.design(d, psu, Double.doubleToLongBits(x == 0 ? 0.0 : x), x, w, RelativeBins.isCodeLike(x));
        }
    }

    /**
     * The whole wave's column i moves to bins: every domain of it is summarised from its counts so far
     * ({@code valueOf} maps a value entry to its number), and its design cells are re-keyed by the bits of their
     * value, keeping the code-like ones.
     */
    void toBins(int i, LongToDoubleFunction valueOf) {
        Col c = cols[i];
        c.waveBinned = true;
        int n = labels.size();
        c.grow(Math.max(n - 1, 0));
        boolean[] fresh = new boolean[n];
        for (int d = 0; d < n; d++) {
            fresh[d] = c.bins[d] == null;
        }
        c.summarise(fresh, valueOf);
        c.dropExactCounts(); // every domain is in bins now: the (domain, value) counts are not read again
        ValueIndex before = c.cells;
        double[] weights = c.cellWeight;
        c.cells = ValueIndex.ofPairs();
        c.cellWeight = new double[256];
        for (int e = 0; e < before.size(); e++) {
            double x = valueOf.applyAsDouble(before.second(e));
            if (RelativeBins.isCodeLike(x)) {
                c.addCell(before.first(e), Double.doubleToLongBits(x == 0 ? 0.0 : x), weights[e], true);
            }
        }
    }

    /**
     * The domains' tallies: {@code texts.get(i)} turns a value entry of column i into its text (null for a column
     * the whole wave summarised in bins); {@code psus} is the whole wave's PSU count.
     */
    DomainTally result(List<SourceColumn> columns, List<LongFunction<String>> texts, int psus) {
        int n = labels.size();
        List<String> domains = new ArrayList<>(n);
        for (int d = 0; d < n; d++) {
            domains.add(new String(labels.bytes(), labels.offset(d), labels.length(d), StandardCharsets.UTF_8));
        }
        Map<String, List<ColumnTally>> tallies = new LinkedHashMap<>();
        Map<String, List<Map<String, double[]>>> weights = new LinkedHashMap<>();
        Map<String, List<DesignSummary.ColumnDesign>> designs = new LinkedHashMap<>();
        for (int i = 0; i < cols.length; i++) {
            Col c = cols[i];
            c.grow(Math.max(n - 1, 0));
            String name = columns.get(i).name();
            ColumnType type = columns.get(i).type();
            LongFunction<String> text = c.waveBinned ? bits -> DesignScan.binnedText(Double.longBitsToDouble(bits))
                    : texts.get(i);
            List<Map<String, Long>> counts = new ArrayList<>(n);
            List<Map<String, double[]>> sums = new ArrayList<>(n);
            for (int d = 0; d < n; d++) {
                counts.add(c.bins[d] != null ? c.bins[d].counts() : new HashMap<>());
                sums.add(c.bins[d] != null && weighted ? c.bins[d].weights() : new HashMap<>());
            }
            // A value held by many domains is turned into text once, and its domains share the one String.
            EntryTexts textOf = new EntryTexts(texts.get(i));
            for (int d = 0; d < n && c.width > 0; d++) {
                if (c.bins[d] != null || d >= c.denseRows) {
                    continue;
                }
                for (int entry = 0; entry < c.width; entry++) {
                    int k = d * c.width + entry;
                    if (c.dcount[k] > 0) {
                        put(counts.get(d), sums.get(d), textOf.of(entry), c.dcount[k], weighted ? c.dwsum[k] : 0,
                                weighted ? c.dwsq[k] : 0);
                    }
                }
            }
            for (int e = 0; e < c.values.size(); e++) {
                int d = Col.domainOf(c.values.first(e));
                if (c.bins[d] != null) {
                    continue; // counted in the domain's bins since
                }
                put(counts.get(d), sums.get(d), textOf.of(Col.entryOf(c.values.first(e))), c.count[e],
                        weighted ? c.wsum[e] : 0, weighted ? c.wsq[e] : 0);
            }
            List<ColumnTally> perDomain = new ArrayList<>(n);
            for (int d = 0; d < n; d++) {
                Binning binning = c.bins[d] == null ? Binning.EXACT : c.bins[d].binning();
                perDomain.add(new ColumnTally(name, type, rows[d], c.nulls[d], counts.get(d), c.truncated[d], binning));
            }
            tallies.put(name, perDomain);
            if (weighted) {
                weights.put(name, sums);
            }
            if (designed) {
                designs.put(name, c.designs(n, psus, text));
            }
            cols[i] = null; // its counts are in the tallies now: the scan's tables go as the result grows
        }
        int overflowDomains = overflowLabels.size();
        return new DomainTally(column, domains, Arrays.copyOf(rows, n), nullRows, overflowDomains, overflowRows,
                tallies, weights, designs);
    }

    /** Adds one value's count, and with weights its sums, to a domain's tallies. */
    private void put(Map<String, Long> counts, Map<String, double[]> sums, String v, long count, double w,
                     double w2) {
        counts.merge(v, count, Long::sum);
        if (weighted) {
            double[] cell = sums.computeIfAbsent(v, k -> new double[2]);
            cell[0] += w;
            cell[1] += w2;
        }
    }

    /** The text of a whole-wave value entry, made once: a value held by many domains shares the one String. */
    private static final class EntryTexts {
        private final LongFunction<String> text;
        private String[] made = new String[16];

        EntryTexts(LongFunction<String> text) {
            this.text = text;
        }

        String of(int entry) {
            if (entry >= made.length) {
                made = Arrays.copyOf(made, Math.max(entry + 1, made.length * 2));
            }
            String v = made[entry];
            if (v == null) {
                v = text.apply(entry);
                made[entry] = v;
            }
            return v;
        }
    }

    private static int[] filled(int n) {
        int[] a = new int[n];
        Arrays.fill(a, -1);
        return a;
    }

    /** One monitored column's counts per domain; arrays indexed by domain grow as domains appear. */
    private final class Col {
        private final boolean numeric;
        private final boolean single;
        private boolean waveBinned;
        private long[] nulls = new long[8];
        private boolean[] truncated = new boolean[8];
        private int[] distinct = new int[8];
        private RelativeBins[] bins = new RelativeBins[8]; // a domain's bins, once it is summarised
        private boolean anyBins;
        // (domain, whole-wave value entry) packed in one long: a single-long index holds a third less per entry than
        // one of pairs, and these entries are most of a scan's memory with breakdowns.
        private ValueIndex values = ValueIndex.ofLongs();
        private int deadEntries; // entries of domains summarised since, dropped when they outnumber the rest
        // Each domain's entries of values chained in the order they came, so one domain is summarised without
        // walking the others': the first and last entry per domain (-1: none), the next entry per entry.
        private int[] firstEntry = filled(8);
        private int[] lastEntry = filled(8);
        private int[] nextEntry = new int[64];
        private long[] count = new long[64];
        private double[] wsum = weighted ? new double[64] : null;
        private double[] wsq = weighted ? new double[64] : null;
        // Entries below DENSE_ENTRIES: slot d * width + entry, for denseRows domains; width grows in powers of two.
        private int width;
        private int denseRows;
        private long[] dcount;
        private double[] dwsum;
        private double[] dwsq;
        private ValueIndex cells = ValueIndex.ofPairs(); // (domain << 32 | PSU, value key); weight in cellWeight
        private double[] cellWeight = new double[256];
        private boolean capped;
        private final ValueIndex domainPsus = ValueIndex.ofPairs(); // (domain, PSU) of the numeric sums
        private double[] psuW = new double[64];
        private double[] psuWy = new double[64];
        private double[] psuWy2 = new double[64];

        Col(boolean numeric, boolean single) {
            this.numeric = numeric;
            this.single = single;
        }

        void grow(int d) {
            if (d >= nulls.length) {
                int n = Math.max(nulls.length * 2, d + 1);
                nulls = Arrays.copyOf(nulls, n);
                truncated = Arrays.copyOf(truncated, n);
                distinct = Arrays.copyOf(distinct, n);
                bins = Arrays.copyOf(bins, n);
                int old = firstEntry.length;
                firstEntry = Arrays.copyOf(firstEntry, n);
                lastEntry = Arrays.copyOf(lastEntry, n);
                Arrays.fill(firstEntry, old, n, -1);
                Arrays.fill(lastEntry, old, n, -1);
            }
        }

        /** The dense slot of (domain d, whole-wave entry e < DENSE_ENTRIES), the arrays grown to hold it. */
        int slot(int d, int e) {
            if (e >= width || d >= denseRows) {
                int w = Math.max(width, Math.min(DENSE_ENTRIES, Math.max(8, Integer.highestOneBit(e) * 2)));
                int r = Math.max(denseRows, Math.max(nulls.length, d + 1));
                long[] nc = new long[r * w];
                double[] nw = weighted ? new double[r * w] : null;
                double[] nq = weighted ? new double[r * w] : null;
                for (int row = 0; row < denseRows; row++) {
                    System.arraycopy(dcount, row * width, nc, row * w, width);
                    if (weighted) {
                        System.arraycopy(dwsum, row * width, nw, row * w, width);
                        System.arraycopy(dwsq, row * width, nq, row * w, width);
                    }
                }
                dcount = nc;
                dwsum = nw;
                dwsq = nq;
                width = w;
                denseRows = r;
            }
            return d * width + e;
        }

        /**
         * Adds domain d's exact counts to its bins: the dense slots in entry order, then its chain of other entries
         * in the order they came; returns how many chained entries there were.
         */
        int addCountsTo(RelativeBins b, int d, LongToDoubleFunction valueOf) {
            if (d < denseRows) {
                for (int entry = 0; entry < width; entry++) {
                    int k = d * width + entry;
                    if (dcount[k] > 0) {
                        b.add(valueOf.applyAsDouble(entry), dcount[k], weighted ? dwsum[k] : 0,
                                weighted ? dwsq[k] : 0);
                    }
                }
            }
            int chained = 0;
            for (int e = firstEntry[d]; e >= 0; e = nextEntry[e]) {
                chained++;
                if (count[e] > 0) {
                    b.add(valueOf.applyAsDouble(entryOf(values.first(e))), count[e], weighted ? wsum[e] : 0,
                            weighted ? wsq[e] : 0);
                }
            }
            return chained;
        }

        /** Entry e, new in values, joins the end of domain d's chain. */
        void link(int d, int e) {
            if (e >= nextEntry.length) {
                nextEntry = Arrays.copyOf(nextEntry, ValueIndex.capacityFor(e, nextEntry.length));
            }
            nextEntry[e] = -1;
            if (lastEntry[d] < 0) {
                firstEntry[d] = e;
            } else {
                nextEntry[lastEntry[d]] = e;
            }
            lastEntry[d] = e;
        }

        /**
         * Moves domain d's exact counts into new bins, walking its chain: the entries in the order they came, as a
         * walk over all entries would meet them, so the bins' sums are added in the same order.
         */
        void summariseOne(int d, LongToDoubleFunction valueOf) {
            bins[d] = newBins();
            anyBins = true;
            deadEntries += addCountsTo(bins[d], d, valueOf);
            if (deadEntries > 4096 && deadEntries * 2L > values.size()) {
                dropDeadEntries();
            }
        }

        static long key(int domain, int entry) {
            return ((long) domain << 32) | entry;
        }

        static int domainOf(long key) {
            return (int) (key >>> 32);
        }

        static int entryOf(long key) {
            return (int) key;
        }

        /**
         * Renumbers the entries of the domains still counted exactly, in the order they came, so the entries of
         * summarised domains (never read again) stop holding memory; every walk over the entries meets the kept
         * ones in the same order as before.
         */
        void dropDeadEntries() {
            ValueIndex old = values;
            long[] oldCount = count;
            double[] oldSum = wsum;
            double[] oldSq = wsq;
            int live = old.size() - deadEntries;
            int n = Math.max(64, Integer.highestOneBit(Math.max(live, 1)) * 2);
            values = ValueIndex.ofLongs();
            count = new long[n];
            wsum = weighted ? new double[n] : null;
            wsq = weighted ? new double[n] : null;
            nextEntry = new int[n];
            Arrays.fill(firstEntry, -1);
            Arrays.fill(lastEntry, -1);
            for (int e = 0; e < old.size(); e++) {
                long k = old.first(e);
                int d = domainOf(k);
                if (bins[d] != null) {
                    continue;
                }
                int f = values.add(k);
                link(d, f);
                count[f] = oldCount[e];
                if (weighted) {
                    wsum[f] = oldSum[e];
                    wsq[f] = oldSq[e];
                }
            }
            deadEntries = 0;
        }

        RelativeBins newBins() {
            anyBins = true;
            return new RelativeBins(DOMAIN_MAX_BINS, 0, single);
        }

        void count(int e, double w) {
            if (e == count.length) {
                count = Arrays.copyOf(count, ValueIndex.capacityFor(e, count.length));
                if (weighted) {
                    wsum = Arrays.copyOf(wsum, count.length);
                    wsq = Arrays.copyOf(wsq, count.length);
                }
            }
            count[e]++;
            if (weighted && !Double.isNaN(w)) {
                wsum[e] += w;
                wsq[e] += w * w;
            }
        }

        /** Moves the exact counts of every domain marked in {@code which} into new bins, as {@link #summariseOne} does. */
        void summarise(boolean[] which, LongToDoubleFunction valueOf) {
            for (int d = 0; d < which.length; d++) {
                if (which[d]) {
                    bins[d] = newBins();
                    addCountsTo(bins[d], d, valueOf);
                }
            }
        }

        void dropExactCounts() {
            width = 0;
            denseRows = 0;
            dcount = null;
            dwsum = null;
            dwsq = null;
            values = ValueIndex.ofLongs();
            deadEntries = 0;
            nextEntry = new int[64];
            Arrays.fill(firstEntry, -1);
            Arrays.fill(lastEntry, -1);
            count = new long[64];
            wsum = weighted ? new double[64] : null;
            wsq = weighted ? new double[64] : null;
        }

        void design(int d, int psu, long valueKey, double x, double w, boolean keepCell) {
            double weightOrZero = Double.isNaN(w) ? 0 : w;
            if (numeric && Double.isFinite(x)) {
                int e = domainPsus.add(d, psu);
                if (e == psuW.length) {
                    int n = ValueIndex.capacityFor(e, psuW.length);
                    psuW = Arrays.copyOf(psuW, n);
                    psuWy = Arrays.copyOf(psuWy, n);
                    psuWy2 = Arrays.copyOf(psuWy2, n);
                }
                psuW[e] += weightOrZero;
                psuWy[e] += weightOrZero * x;
                psuWy2[e] += weightOrZero * x * x;
            }
            if (keepCell) { // else the domain is summarised or truncated, and so reported incomplete
                addCell(((long) d << 32) | psu, valueKey, weightOrZero, numeric && RelativeBins.isCodeLike(x));
            }
        }

        /** A cell's weight; a new cell beyond the cap is kept only when it is a code-like number. */
        void addCell(long domainPsu, long valueKey, double w, boolean codeLike) {
            int e = cells.add(domainPsu, valueKey, MAX_CELLS);
            if (e < 0) {
                capped = true;
                if (!codeLike) {
                    return;
                }
                e = cells.add(domainPsu, valueKey);
            }
            if (e == cellWeight.length) {
                cellWeight = Arrays.copyOf(cellWeight, ValueIndex.capacityFor(e, cellWeight.length));
            }
            cellWeight[e] += w;
        }

        /** Each domain's PSU sums over all {@code psus} PSUs of the wave, zero where the domain has none. */
        List<DesignSummary.ColumnDesign> designs(int n, int psus, LongFunction<String> text) {
            // Which domains keep every value is decided from their numbers of distinct values first, so that dense
            // per-PSU arrays are made only for what is kept: the domains within the budget, in order, and the
            // code-like values of the others (so that missing codes can still be taken out).
            List<java.util.Set<Long>> distinctValues = new ArrayList<>(n);
            for (int d = 0; d < n; d++) {
                distinctValues.add(new java.util.HashSet<>());
            }
            for (int e = 0; e < cells.size(); e++) {
                distinctValues.get((int) (cells.first(e) >>> 32)).add(cells.second(e));
            }
            boolean[] whole = new boolean[n];
            long budget = MAX_CELLS; // dense per-PSU values, spent by domains in order
            for (int d = 0; d < n; d++) {
                long dense = (long) distinctValues.get(d).size() * psus;
                whole[d] = !capped && !waveBinned && bins[d] == null && !truncated[d] && dense <= budget;
                if (whole[d]) {
                    budget -= dense;
                }
            }
            Map<Long, String> texts = new java.util.HashMap<>();
            List<Map<Long, double[]>> byValue = new ArrayList<>(n);
            for (int d = 0; d < n; d++) {
                byValue.add(new LinkedHashMap<>());
            }
            for (int e = 0; e < cells.size(); e++) {
                long dp = cells.first(e);
                int d = (int) (dp >>> 32);
                int psu = (int) dp;
                long key = cells.second(e);
                if (!whole[d] && !DesignScan.isCodeLikeText(texts.computeIfAbsent(key, text::apply))) {
                    continue;
                }
                byValue.get(d).computeIfAbsent(key, k -> new double[psus])[psu] += cellWeight[e];
            }
            List<DesignSummary.ColumnDesign> out = new ArrayList<>(n);
            for (int d = 0; d < n; d++) {
                boolean complete = whole[d];
                Map<String, double[]> kept = new LinkedHashMap<>();
                byValue.get(d).forEach((key, sums) -> {
                    String t = texts.computeIfAbsent(key, text::apply);
                    if (complete || DesignScan.isCodeLikeText(t)) {
                        double[] before = kept.get(t);
                        if (before == null) {
                            kept.put(t, sums);
                        } else {
                            for (int p = 0; p < sums.length; p++) {
                                before[p] += sums[p];
                            }
                        }
                    }
                });
                double[] w = numeric ? new double[psus] : null;
                double[] wy = numeric ? new double[psus] : null;
                double[] wy2 = numeric ? new double[psus] : null;
                out.add(new DesignSummary.ColumnDesign(kept, complete, w, wy, wy2));
            }
            if (numeric) {
                for (int e = 0; e < domainPsus.size(); e++) {
                    DesignSummary.ColumnDesign cd = out.get((int) domainPsus.first(e));
                    int psu = (int) domainPsus.second(e);
                    cd.weight()[psu] += psuW[e];
                    cd.weightedSum()[psu] += psuWy[e];
                    cd.weightedSquares()[psu] += psuWy2[e];
                }
            }
            return out;
        }
    }
}
