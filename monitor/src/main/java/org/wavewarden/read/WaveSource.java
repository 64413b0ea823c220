package org.wavewarden.read;

import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.Identifiers.TableName;

import java.util.Optional;

/**
 * Where a dataset's waves are: one table with a wave column, or one table per wave named by a pattern; with a
 * release column, several releases of a wave sit side by side and only the latest is the wave.
 * All SQL text produced here uses identifiers that were validated and are double-quoted.
 *
 * @param releaseColumn the column telling releases of a wave apart, or null when each wave is published once
 */
public record WaveSource(TableName table, String waveColumn, String tablePattern, String releaseColumn) {

    public WaveSource(TableName table, String waveColumn, String tablePattern) {
        this(table, waveColumn, tablePattern, null);
    }

    public static WaveSource of(DatasetConfig d, String key) {
        String release = d.releaseColumn() == null ? null
                : Identifiers.require(key + ".releases.column", d.releaseColumn());
        if (d.table() != null) {
            return new WaveSource(TableName.parse(key + ".table", d.table()),
                    Identifiers.require(key + ".waveColumn", d.waveColumn()), null, release);
        }
        return new WaveSource(null, null, d.tablePattern(), release);
    }

    /**
     * The earlier publication of a dataset kept in {@code releases.previousTable}: the same layout in another table
     * (or another pattern of per-wave tables).
     */
    public static WaveSource previousPublication(DatasetConfig d, String key) {
        if (d.releases() == null || d.releases().previousTable() == null) {
            throw new IllegalArgumentException("dataset " + d.name() + " keeps no previous table");
        }
        String prev = d.releases().previousTable();
        if (d.table() != null) {
            return new WaveSource(TableName.parse(key + ".releases.previousTable", prev),
                    Identifiers.require(key + ".waveColumn", d.waveColumn()), null, null);
        }
        return new WaveSource(null, null, prev, null);
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
     * standard_conforming_strings; identifiers are validated and quoted. With a release column only the wave's
     * latest release is selected: the greatest value of the column in the column's own sort order, so that a
     * revised wave is judged as published, and rows whose release is NULL belong to no release.
     */
    public String fromClause(String wave) {
        StringBuilder sb = new StringBuilder(" FROM ").append(tableFor(wave).quoted());
        if (!onePerWave()) {
            sb.append(" WHERE ").append(Identifiers.quote(waveColumn)).append("::text = ").append(literal(wave));
        }
        if (releaseColumn != null) {
            String rc = Identifiers.quote(releaseColumn);
            sb.append(onePerWave() ? " WHERE " : " AND ").append(rc).append(" = (SELECT max(r.").append(rc)
                    .append(") FROM ").append(tableFor(wave).quoted()).append(" r");
            if (!onePerWave()) {
                sb.append(" WHERE r.").append(Identifiers.quote(waveColumn)).append("::text = ").append(literal(wave));
            }
            sb.append(')');
        }
        return sb.toString();
    }

    /** {@code FROM table WHERE [wave = 'label' AND] release = 'label'}: one given release of a wave. */
    public String fromClause(String wave, String release) {
        if (releaseColumn == null) {
            throw new IllegalStateException("this source has no release column");
        }
        StringBuilder sb = new StringBuilder(" FROM ").append(tableFor(wave).quoted()).append(" WHERE ");
        if (!onePerWave()) {
            sb.append(Identifiers.quote(waveColumn)).append("::text = ").append(literal(wave)).append(" AND ");
        }
        return sb.append(Identifiers.quote(releaseColumn)).append("::text = ").append(literal(release)).toString();
    }

    /** A label as an SQL string literal, for COPY, which takes no bind parameters. */
    static String literal(String label) {
        try {
            return "'" + org.postgresql.core.Utils.escapeLiteral(null, label, true) + "'";
        } catch (java.sql.SQLException e) {
            throw new IllegalArgumentException("label cannot be used: " + e.getMessage(), e);
        }
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
