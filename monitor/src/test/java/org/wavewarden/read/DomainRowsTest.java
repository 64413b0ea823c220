package org.wavewarden.read;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.profile.DesignSummary;
import org.wavewarden.profile.DomainTally;
import org.wavewarden.profile.RelativeBins;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.TreeMap;
import java.util.function.LongFunction;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * Rows held in chunks and handed to the domains in order of domain give the tallies of handing every cell over as
 * its row is read: per domain the cells still come in the order of their rows, so counts, bins and every
 * floating-point sum are bit for bit the same, however the chunks fall (full chunks, and hand-overs in the middle of
 * a row, as before the whole wave moves a column to bins). Invented data: a property over random rows.
 */
class DomainRowsTest {

    private static final int COLUMNS = 5;

    @ParameterizedTest(name = "seed {0}, chunk of {1} rows, weighted {2}, design {3}")
    @CsvSource({
            "1, 7, false, false",
            "2, 1, true, false",
            "3, 64, true, true",
            "4, 13, false, true",
            "5, 3, true, true",
            "6, 500, false, false",
            "7, 2, true, true",
            "8, 31, true, false",
    })
    void chunkedHandOverGivesTheTalliesOfRowByRow(long seed, int chunk, boolean weighted, boolean designed) {
        Random rnd = new Random(seed);
        int rows = 3000;
        int exactNumbers = 20;
        boolean[] numeric = {true, true, true, true, true};
        boolean[] single = new boolean[COLUMNS];
        ValueTally[] wave = new ValueTally[COLUMNS];
        for (int i = 0; i < COLUMNS; i++) {
            wave[i] = new ValueTally(Decode.FLOAT8, weighted);
        }
        DomainScan direct = new DomainScan("district", 6, exactNumbers, numeric, single, weighted, designed, wave);
        DomainScan chunked = new DomainScan("district", 6, exactNumbers, numeric, single, weighted, designed, wave);
        DomainRows held = new DomainRows(new DomainScan[]{chunked}, numeric, chunk);
        for (int r = 0; r < rows; r++) {
            double w = weighted && rnd.nextInt(50) > 0 ? 0.5 + rnd.nextInt(7) * 0.37 : Double.NaN;
            int psu = designed ? rnd.nextInt(9) : -1;
            byte[] label = rnd.nextInt(40) == 0 ? null
                    : ("D" + rnd.nextInt(8)).getBytes(StandardCharsets.UTF_8); // 8 labels, 6 kept
            int len = label == null ? -1 : label.length;
            int d = direct.domain(label, 0, len);
            held.row(w, psu);
            held.domain(0, chunked.domain(label, 0, len));
            for (int i = 0; i < COLUMNS; i++) {
                if (rnd.nextInt(60) == 0) { // the scanner hands over mid-row before the wave moves a column to bins
                    held.flush();
                }
                if (rnd.nextInt(15) == 0) {
                    if (d >= 0) {
                        direct.nullCell(i, d);
                    }
                    held.cell(i, DomainRows.NULL, Double.NaN, 0, false);
                    continue;
                }
                double x = value(rnd, i);
                int entry = wave[i].add(Double.doubleToLongBits(x), Integer.MAX_VALUE, w);
                if (d >= 0) {
                    long fine = direct.binsIn(i) ? RelativeBins.fineKey(x) : RelativeBins.EXACT;
                    direct.add(i, d, psu, entry, x, fine, w);
                }
                held.cell(i, entry, x, 0, false);
            }
            held.endRow();
        }
        held.flush();

        List<SourceColumn> columns = new ArrayList<>();
        List<LongFunction<String>> texts = new ArrayList<>();
        for (int i = 0; i < COLUMNS; i++) {
            columns.add(new SourceColumn("v" + i, ColumnType.DECIMAL, "float8"));
            ValueTally t = wave[i];
            texts.add(e -> t.text((int) e));
        }
        String expected = render(direct.result(columns, texts, designed ? 9 : 0));
        assertEquals(expected, render(chunked.result(columns, texts, designed ? 9 : 0)));
    }

    @org.junit.jupiter.api.Test
    void aChunkHoldsAboutAMillionCellsWhateverTheColumns() {
        assertEquals(26_214, DomainRows.rowsFor(40));
        assertEquals(65_536, DomainRows.rowsFor(1)); // at most 65,536 rows
        assertEquals(65_536, DomainRows.rowsFor(0));
        assertEquals(1_024, DomainRows.rowsFor(5_000)); // at least 1,024 rows
    }

    /**
     * Column 0: a short scale (dense slots); 1: 150 values (past the dense slots); 2: continuous (bins past the
     * budget); 3: codes and a continuous part; 4: a few values with a code.
     */
    private static double value(Random rnd, int column) {
        return switch (column) {
            case 0 -> 1 + rnd.nextInt(5);
            case 1 -> rnd.nextInt(150) * 0.5;
            case 2 -> 100 + 15 * rnd.nextGaussian();
            case 3 -> rnd.nextInt(10) == 0 ? -9 : Math.exp(rnd.nextGaussian());
            default -> rnd.nextInt(20) == 0 ? 999 : rnd.nextInt(3);
        };
    }

    /** Every count, flag, level and sum of the tallies, bit for bit, in a canonical order. */
    private static String render(DomainTally t) {
        StringBuilder s = new StringBuilder();
        s.append(t.domains()).append(Arrays.toString(t.rows())).append(' ').append(t.nullRows()).append(' ')
                .append(t.overflowDomains()).append(' ').append(t.overflowRows()).append('\n');
        for (var c : new TreeMap<>(t.tallies()).entrySet()) {
            for (var ct : c.getValue()) {
                s.append(c.getKey()).append(' ').append(ct.rowCount()).append(' ').append(ct.nullCount()).append(' ')
                        .append(ct.truncated()).append(' ').append(ct.binning().level()).append(' ')
                        .append(new TreeMap<>(ct.valueCounts())).append('\n');
            }
        }
        for (var c : new TreeMap<>(t.weights()).entrySet()) {
            for (Map<String, double[]> m : c.getValue()) {
                new TreeMap<>(m).forEach((v, w) -> s.append(c.getKey()).append(' ').append(v).append('=')
                        .append(Double.doubleToLongBits(w[0])).append(',').append(Double.doubleToLongBits(w[1]))
                        .append('\n'));
            }
        }
        for (var c : new TreeMap<>(t.designs()).entrySet()) {
            for (DesignSummary.ColumnDesign cd : c.getValue()) {
                s.append(c.getKey()).append(' ').append(cd.complete()).append(Arrays.toString(cd.weight()))
                        .append(Arrays.toString(cd.weightedSum())).append(Arrays.toString(cd.weightedSquares()));
                new TreeMap<>(cd.cells()).forEach((v, sums) -> s.append(' ').append(v).append('=')
                        .append(Arrays.toString(sums)));
                s.append('\n');
            }
        }
        return s.toString();
    }
}
