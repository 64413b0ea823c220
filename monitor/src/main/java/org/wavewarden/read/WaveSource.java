package org.wavewarden.read;

import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.Identifiers.TableName;

import java.util.Optional;

/**
 * Where a dataset's waves are: one table with a wave column, or one table per wave named by a pattern.
 * All SQL text produced here uses identifiers that were validated and are double-quoted.
 */
public record WaveSource(TableName table, String waveColumn, String tablePattern) {

    public static WaveSource of(DatasetConfig d, String key) {
        if (d.table() != null) {
            return new WaveSource(TableName.parse(key + ".table", d.table()),
                    Identifiers.require(key + ".waveColumn", d.waveColumn()), null);
        }
        return new WaveSource(null, null, d.tablePattern());
    }

    public boolean onePerWave() {
        return tablePattern != null;
    }

    /** The table holding a given wave. */
    public TableName tableFor(String wave) {
        if (!onePerWave()) {
            return table;
        }
        return TableName.parse("tablePattern", tablePattern.replace("{wave}", wave));
    }

    /**
     * {@code FROM table [WHERE wave = 'label']} for a COPY of one wave. COPY takes no bind parameters, so the wave
     * label (read from the source itself) is escaped by the driver's literal escaping under
     * standard_conforming_strings; identifiers are validated and quoted.
     */
    public String fromClause(String wave) {
        StringBuilder sb = new StringBuilder(" FROM ").append(tableFor(wave).quoted());
        if (!onePerWave()) {
            try {
                sb.append(" WHERE ").append(Identifiers.quote(waveColumn)).append("::text = '")
                        .append(org.postgresql.core.Utils.escapeLiteral(null, wave, true)).append('\'');
            } catch (java.sql.SQLException e) {
                throw new IllegalArgumentException("wave label cannot be used: " + e.getMessage(), e);
            }
        }
        return sb.toString();
    }

    /** The pattern's schema and the fixed text around {wave}, for listing the per-wave tables. */
    public Optional<String[]> patternParts() {
        if (!onePerWave()) {
            return Optional.empty();
        }
        String schema = tablePattern.contains(".") ? tablePattern.substring(0, tablePattern.indexOf('.')) : "public";
        String name = tablePattern.contains(".") ? tablePattern.substring(tablePattern.indexOf('.') + 1) : tablePattern;
        int at = name.indexOf("{wave}");
        return Optional.of(new String[] {schema, name.substring(0, at), name.substring(at + "{wave}".length())});
    }
}
