package org.wavewarden.read;

import org.wavewarden.profile.ValueIndex;

import java.util.Arrays;
import java.util.HashMap;
import java.util.Map;

/**
 * One column's counts per distinct value during a scan, with no object per cell: the values are numbered by a
 * {@link ValueIndex} (by their bits, or by their bytes for {@link Decode#bytesKeyed} types) and each number's count,
 * and with weights its sum of weights and of squared weights, sit in arrays. Text is made once per distinct value,
 * at the end ({@link #counts}, {@link #weights}).
 */
final class ValueTally {

    private final Decode decode;
    private final boolean weighted;
    private final ValueIndex index;
    private long[] count = new long[32];
    private double[] wsum;
    private double[] wsq;

    ValueTally(Decode decode, boolean weighted) {
        this.decode = decode;
        this.weighted = weighted;
        this.index = decode.bytesKeyed() ? ValueIndex.ofBytes() : ValueIndex.ofLongs();
        if (weighted) {
            wsum = new double[32];
            wsq = new double[32];
        }
    }

    /** Counts one cell by its key of weight w (NaN: none); its entry, or -1 when it is new and {@code max} are held. */
    int add(long key, int max, double w) {
        return counted(index.add(key, 0, max), w);
    }

    /** Counts one cell by its bytes; its entry, or -1 when it is new and {@code max} are held. */
    int add(byte[] b, int p, int len, int max, double w) {
        return counted(index.add(b, p, len, max), w);
    }

    private int counted(int e, double w) {
        if (e < 0) {
            return e;
        }
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
        return e;
    }

    int size() {
        return index.size();
    }

    /** An entry's number (the column is numeric). */
    double number(int e) {
        return decode.bytesKeyed() ? decode.number(index.bytes(), index.offset(e), index.length(e))
                : decode.number(index.first(e));
    }

    /** An entry's text, as tallied. */
    String text(int e) {
        return decode.bytesKeyed() ? ValueText.ofBytes(decode, index.bytes(), index.offset(e), index.length(e))
                : ValueText.kept(ValueText.of(decode, index.first(e)));
    }

    /** One entry with its count and weight sums (zero without weights). */
    interface Entry {
        void accept(int entry, long count, double sumW, double sumW2);
    }

    void forEach(Entry x) {
        for (int e = 0; e < index.size(); e++) {
            x.accept(e, count[e], weighted ? wsum[e] : 0, weighted ? wsq[e] : 0);
        }
    }

    /** Count per text; values of one text (none today, but text forms are not promised distinct) are summed. */
    Map<String, Long> counts() {
        Map<String, Long> out = new HashMap<>(Math.max(16, size() * 2));
        forEach((e, c, w, w2) -> out.merge(text(e), c, Long::sum));
        return out;
    }

    /** {@code {sum of weights, sum of squared weights}} per text. */
    Map<String, double[]> weights() {
        Map<String, double[]> out = new HashMap<>(Math.max(16, size() * 2));
        forEach((e, c, w, w2) -> {
            double[] cell = out.computeIfAbsent(text(e), x -> new double[2]);
            cell[0] += w;
            cell[1] += w2;
        });
        return out;
    }
}
