package org.wavewarden.read;

import org.jdbi.v3.core.Handle;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.WaveOrder;

import java.math.BigDecimal;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/** Lists a dataset's waves in wave order. */
public final class WaveListing {

    private WaveListing() {
    }

    public static List<WaveInfo> list(Handle h, WaveSource source, WaveOrder order) {
        return list(h, source, order, false);
    }

    /**
     * Lists the waves; with {@code fingerprints}, the same single pass also sums a hash of every row's text, so
     * the daemon notices rows edited in place (the row count alone would not change).
     */
    public static List<WaveInfo> list(Handle h, WaveSource source, WaveOrder order, boolean fingerprints) {
        Map<String, long[]> rows = new LinkedHashMap<>();
        String hash = fingerprints ? ", coalesce(sum(hashtext(t::text)::bigint), 0) AS f" : ", 0::bigint AS f";
        if (source.onePerWave()) {
            String[] parts = source.patternParts().orElseThrow();
            for (String table : SourceCatalog.tablesMatching(h, parts[0], parts[1], parts[2])) {
                String wave = table.substring(parts[1].length(), table.length() - parts[2].length());
                long[] nf = h.createQuery("SELECT count(*) AS n" + hash + " FROM " + source.tableFor(wave).quoted()
                        + " t").map((rs, ctx) -> new long[] {rs.getLong("n"), rs.getLong("f")}).one();
                rows.put(wave, nf);
            }
        } else {
            String col = org.wavewarden.config.Identifiers.quote(source.waveColumn());
            h.createQuery("SELECT t." + col + "::text AS wave, count(*) AS n" + hash + " FROM " + source.table().quoted()
                            + " t WHERE t." + col + " IS NOT NULL GROUP BY 1")
                    .map((rs, ctx) -> Map.entry(rs.getString("wave"), new long[] {rs.getLong("n"), rs.getLong("f")}))
                    .forEach(e -> rows.put(e.getKey(), e.getValue()));
        }
        return ordered(rows, order);
    }

    static List<WaveInfo> ordered(Map<String, long[]> rows, WaveOrder order) {
        List<String> labels = new ArrayList<>(rows.keySet());
        if (order.isNatural()) {
            labels.sort(naturalOrder(labels));
        } else {
            List<String> known = order.explicit();
            List<String> unknown = labels.stream().filter(l -> !known.contains(l)).toList();
            if (!unknown.isEmpty()) {
                throw new ConfigException("waveOrder", "the source has waves not in the configured order: " + unknown);
            }
            labels = known.stream().filter(rows::containsKey).toList();
        }
        return labels.stream().map(l -> new WaveInfo(l, rows.get(l)[0], rows.get(l)[1])).toList();
    }

    /** Numeric order when every label is a number, else text order (which suits 2025-Q1 or 2025-03 labels). */
    public static Comparator<String> naturalOrder(List<String> labels) {
        boolean numeric = !labels.isEmpty() && labels.stream().allMatch(l -> l.matches("-?\\d+(\\.\\d+)?"));
        return numeric ? Comparator.comparing(BigDecimal::new) : Comparator.naturalOrder();
    }
}
