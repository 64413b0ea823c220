package org.wavewarden.read;

import org.wavewarden.profile.RelativeBins;

import java.util.Arrays;

/**
 * A chunk of the scan's rows held for the {@link DomainScan}s, which take them domain by domain: per breakdown
 * column the rows are put in order of their domain (a stable counting sort, so each domain still meets its rows in
 * the order they came and its tallies are bit for bit those of taking the rows one by one), and each monitored
 * column's cells are then added in that order. One domain's tallies are then worked on for a run of cells while they
 * sit in the cache; taken row by row, with hundreds of interviewers, every cell was a cache miss in another domain's
 * tables.
 *
 * <p>A cell is kept as its whole-wave value entry (or what stands for a NULL, a number of a column the whole wave
 * holds in bins, or a value the whole wave could not keep), its number, and its bin key at level 0 once some
 * breakdown needed it. The rows are handed over when the chunk is full, before the whole wave moves a column to bins
 * ({@link #flush}, which keeps the row being read), and at the end.
 */
final class DomainRows {

    /**
     * Cells held before they are handed over: about 20 bytes each, so 21 MB whatever the number of columns. The more
     * rows a chunk holds, the more cells each domain takes while its tables are in the cache: with 300 interviewers
     * and 40 columns, 16,384 rows took 3.6 s and 65,536 rows 2.9 s for a 300,000-row wave (the plain scan 1.0 s).
     */
    static final int CELLS = 1 << 20;

    /** Rows a chunk holds for {@code columns} monitored columns: {@link #CELLS} spread over them, 1,024 to 65,536. */
    static int rowsFor(int columns) {
        return Math.max(1024, Math.min(65536, CELLS / Math.max(columns, 1)));
    }

    /** Cell codes besides a value entry (0 or more). */
    static final int NULL = -1;
    static final int NUMBER = -2;
    static final int TRUNCATED = -3;

    /** No bin key worked out yet (neither {@link RelativeBins#EXACT} nor any level-0 key). */
    private static final long UNKNOWN = Long.MIN_VALUE + 1;

    private final DomainScan[] scans;
    private final int columns;
    private final int capacity;
    private final boolean[] numeric;
    private final int[] domain; // [breakdown * capacity + row], -1: none
    private final double[] weight;
    private final int[] psu;
    private final int[] code; // [column * capacity + row]
    private final double[] x;
    private final long[] fine;
    private final int[] order;
    private int[] starts = new int[64];
    private int rows; // completed rows held; the row being read, if any, is at index rows

    DomainRows(DomainScan[] scans, boolean[] numeric, int capacity) {
        this.scans = scans;
        this.columns = numeric.length;
        this.numeric = numeric;
        this.capacity = capacity;
        domain = new int[scans.length * capacity];
        weight = new double[capacity];
        psu = new int[capacity];
        code = new int[columns * capacity];
        x = new double[columns * capacity];
        fine = new long[columns * capacity];
        order = new int[capacity];
    }

    /** Starts a row of weight w (NaN: none) in PSU psu (-1: none). */
    void row(double w, int psu) {
        weight[rows] = w;
        this.psu[rows] = psu;
    }

    /** The row's domain in breakdown column j; -1 when it has none (NULL or beyond the cap). */
    void domain(int j, int d) {
        domain[j * capacity + rows] = d;
    }

    /**
     * The row's cell of column i: {@code code} is its whole-wave value entry or {@link #NULL}, {@link #NUMBER} or
     * {@link #TRUNCATED}; {@code fineKey} is its {@link RelativeBins#fineKey} when known, else anything for an entry.
     */
    void cell(int i, int code, double x, long fineKey, boolean fineKnown) {
        int k = i * capacity + rows;
        this.code[k] = code;
        this.x[k] = x;
        this.fine[k] = fineKnown ? fineKey : UNKNOWN;
    }

    /** Ends the row; a full chunk is handed over. */
    void endRow() {
        rows++;
        if (rows == capacity) {
            handOver();
            rows = 0;
        }
    }

    /** Hands the completed rows over; the row being read stays and becomes the first of the next chunk. */
    void flush() {
        if (rows == 0) {
            return;
        }
        handOver();
        weight[0] = weight[rows];
        psu[0] = psu[rows];
        for (int j = 0; j < scans.length; j++) {
            domain[j * capacity] = domain[j * capacity + rows];
        }
        for (int i = 0; i < columns; i++) {
            int k = i * capacity;
            code[k] = code[k + rows];
            x[k] = x[k + rows];
            fine[k] = fine[k + rows];
        }
        rows = 0;
    }

    private void handOver() {
        for (int j = 0; j < scans.length; j++) {
            int n = sortByDomain(j);
            DomainScan s = scans[j];
            for (int i = 0; i < columns; i++) {
                int base = i * capacity;
                boolean num = numeric[i];
                for (int o = 0; o < n; o++) {
                    int r = order[o];
                    int d = domain[j * capacity + r];
                    int k = base + r;
                    int c = code[k];
                    if (c >= 0) {
                        long f = fine[k];
                        // Asked per cell: a domain moves to bins during the chunk. Worked out once per cell.
                        if (f == UNKNOWN && num && s.binsIn(i)) {
                            f = RelativeBins.fineKey(x[k]);
                            fine[k] = f;
                        }
                        s.add(i, d, psu[r], c, x[k], f, weight[r]);
                    } else if (c == NULL) {
                        s.nullCell(i, d);
                    } else if (c == NUMBER) {
                        s.addNumber(i, d, psu[r], x[k], fine[k], weight[r]);
                    } else {
                        s.truncated(i, d, psu[r], weight[r]);
                    }
                }
            }
        }
    }

    /** Puts the held rows with a domain in breakdown j in order of domain, stable; returns how many there are. */
    private int sortByDomain(int j) {
        int at = j * capacity;
        int max = -1;
        for (int r = 0; r < rows; r++) {
            max = Math.max(max, domain[at + r]);
        }
        if (max + 2 > starts.length) {
            starts = new int[Math.max(max + 2, starts.length * 2)];
        }
        Arrays.fill(starts, 0, max + 2, 0);
        for (int r = 0; r < rows; r++) {
            int d = domain[at + r];
            if (d >= 0) {
                starts[d + 1]++;
            }
        }
        for (int d = 0; d <= max; d++) {
            starts[d + 1] += starts[d];
        }
        int n = max < 0 ? 0 : starts[max + 1];
        for (int r = 0; r < rows; r++) {
            int d = domain[at + r];
            if (d >= 0) {
                order[starts[d]++] = r;
            }
        }
        return n;
    }
}
