package org.wavewarden.pipeline;

import org.jdbi.v3.core.Handle;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.CompareWith;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.Identifiers.TableName;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.config.RelationshipConfig;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.read.SourceCatalog;
import org.wavewarden.read.SourceColumn;
import org.wavewarden.read.WaveSource;

import java.util.ArrayList;
import java.util.List;
import java.util.stream.Collectors;

/**
 * The part of config validation that needs the database: every configured table and column must exist in the
 * source catalog, so a typo fails up front with its key, never in the middle of a run.
 */
public final class CatalogCheck {

    private CatalogCheck() {
    }

    public static void verify(Handle source, WardenConfig config) {
        for (int i = 0; i < config.datasets().size(); i++) {
            verify(source, config.datasets().get(i), "datasets[" + i + "]");
        }
    }

    static void verify(Handle h, DatasetConfig d, String key) {
        WaveSource src = WaveSource.of(d, key);
        List<SourceColumn> columns;
        List<TableName> tables;
        if (src.onePerWave()) {
            String[] parts = src.patternParts().orElseThrow();
            List<String> names = SourceCatalog.tablesMatching(h, parts[0], parts[1], parts[2]);
            if (names.isEmpty()) {
                throw new ConfigException(key + ".tablePattern", "no table in schema " + parts[0] + " matches "
                        + d.tablePattern());
            }
            tables = names.stream().filter(Identifiers::isPlain).map(t -> new TableName(parts[0], t)).toList();
            String last = names.get(names.size() - 1);
            columns = SourceCatalog.columns(h, src.tableFor(last.substring(parts[1].length(),
                    last.length() - parts[2].length())));
        } else {
            if (!SourceCatalog.tableExists(h, src.table())) {
                throw new ConfigException(key + ".table", "table " + src.table() + " does not exist in the source"
                        + " database (or this role cannot see it)");
            }
            columns = SourceCatalog.columns(h, src.table());
            tables = List.of(src.table());
            if (columns.stream().noneMatch(c -> c.name().equals(d.waveColumn()))) {
                throw new ConfigException(key + ".waveColumn", "column " + d.waveColumn() + " does not exist in "
                        + src.table() + "; it has " + names(columns));
            }
        }
        for (int j = 0; j < d.variables().size(); j++) {
            VariableConfig v = d.variables().get(j);
            String at = key + ".variables[" + j + "]";
            SourceColumn column = columns.stream().filter(c -> c.name().equals(v.name())).findFirst().orElseThrow(() ->
                    new ConfigException(at + ".name", "column " + v.name() + " does not exist in the source table;"
                            + " it has " + names(columns)));
            if (v.kind() == VariableKind.DATE && column.type() != ColumnType.DATE
                    && column.type() != ColumnType.TIMESTAMP) {
                throw new ConfigException(at + ".kind", "kind date needs a date or timestamp column, but " + v.name()
                        + " is " + column.postgresType() + "; declare it as text (screened for disguised missing"
                        + " values) or " + (column.type().isNumeric() ? "continuous" : "categorical") + " instead");
            }
            if (!v.missingRanges().isEmpty() && !column.type().isNumeric()) {
                throw new ConfigException(at + ".missingRanges", "missing ranges are ranges of numbers, but "
                        + v.name() + " is " + column.postgresType() + "; list its codes under missingCodes instead");
            }
            if (v.successValue() != null) {
                successValueOccurs(h, tables, v, column, at + ".successValue");
            }
        }
        for (int j = 0; j < d.compareWith().rules().size(); j++) {
            if (d.compareWith().rules().get(j) instanceof CompareWith.Baseline b) {
                baselineExists(h, src, tables, b.wave(), key + ".compareWith" + (d.compareWith()
                        instanceof CompareWith.Alongside ? "[" + j + "]" : "") + ".baseline");
            }
        }
        for (int j = 0; j < d.breakdowns().columns().size(); j++) {
            String name = d.breakdowns().columns().get(j);
            if (columns.stream().noneMatch(c -> c.name().equals(name))) {
                throw new ConfigException(key + ".breakdowns.columns[" + j + "]", "column " + name + " does not"
                        + " exist in the source table; it has " + names(columns));
            }
        }
        for (int j = 0; j < d.breakdowns().keyVariables().size(); j++) {
            String name = d.breakdowns().keyVariables().get(j);
            if (columns.stream().noneMatch(c -> c.name().equals(name))) {
                throw new ConfigException(key + ".breakdowns.keyVariables[" + j + "]", "column " + name + " does not"
                        + " exist in the source table; it has " + names(columns));
            }
        }
        if (d.readyTable() != null) {
            var rt = org.wavewarden.config.Identifiers.TableName.parse(key + ".readyTable", d.readyTable());
            List<SourceColumn> rc = SourceCatalog.columns(h, rt);
            if (rc.isEmpty()) {
                throw new ConfigException(key + ".readyTable", "table " + rt + " does not exist in the source database");
            }
            if (rc.stream().noneMatch(c -> c.name().equals(d.readyColumn()))) {
                throw new ConfigException(key + ".readyColumn", "column " + d.readyColumn() + " does not exist in " + rt);
            }
        }
        if (d.weightColumn() != null) {
            SourceColumn w = columns.stream().filter(c -> c.name().equals(d.weightColumn())).findFirst().orElseThrow(
                    () -> new ConfigException(key + ".weightColumn", "column " + d.weightColumn() + " does not exist"
                            + " in the source table; it has " + names(columns)));
            if (!w.type().isNumeric()) {
                throw new ConfigException(key + ".weightColumn", "expected a numeric column (an INTEGER or DECIMAL"
                        + " type such as integer, numeric or double precision) holding the survey weights, but "
                        + w.name() + " is " + w.postgresType());
            }
        }
        if (d.design() != null) {
            for (String[] c : new String[][] {{"strata", d.design().strata()}, {"clusters", d.design().clusters()}}) {
                if (c[1] != null && columns.stream().noneMatch(x -> x.name().equals(c[1]))) {
                    throw new ConfigException(key + ".design." + c[0], "column " + c[1] + " does not exist in the"
                            + " source table; it has " + names(columns));
                }
            }
        }
        if (d.respondentKey() != null && columns.stream().noneMatch(c -> c.name().equals(d.respondentKey()))) {
            throw new ConfigException(key + ".respondentKey", "column " + d.respondentKey() + " does not exist in the"
                    + " source table; it has " + names(columns));
        }
        if (d.releaseColumn() != null && columns.stream().noneMatch(c -> c.name().equals(d.releaseColumn()))) {
            throw new ConfigException(key + ".releases.column", "column " + d.releaseColumn() + " does not exist in"
                    + " the source table; it has " + names(columns));
        }
        if (d.releases() != null && d.releases().previousTable() != null) {
            verifyPreviousTable(h, d, key);
        }
        for (int j = 0; j < d.relationships().size(); j++) {
            RelationshipConfig r = d.relationships().get(j);
            String at = key + ".relationships[" + j + "]";
            monitoredNumber(d, columns, at + ".x", r.x());
            monitoredNumber(d, columns, at + ".y", r.y());
        }
        for (int j = 0; j < d.exclude().size(); j++) {
            String name = d.exclude().get(j);
            if (columns.stream().noneMatch(c -> c.name().equals(name))) {
                throw new ConfigException(key + ".exclude[" + j + "]", "column " + name + " does not exist in the"
                        + " source table");
            }
        }
    }

    /**
     * A binary variable's configured success value must occur somewhere in the source, or every wave reads 0%
     * and the comparison says "stable" about nothing. The value is compared as the column prints, which is how the
     * scan keys its answers (a boolean prints t or f). One EXISTS per variable, which stops at the first match and
     * uses an index on a text column where there is one; a column with no answers yet is not judged.
     */
    private static void successValueOccurs(Handle h, List<TableName> tables, VariableConfig v, SourceColumn source,
                                           String key) {
        String column = Identifiers.quote(v.name());
        String printed = "format('%s', " + column + ")";
        // A text column prints as it is stored, so it is compared directly, where an index on it can serve.
        boolean asStored = source.postgresType().equals("text") || source.postgresType().startsWith("character varying");
        String match = tables.stream().map(t -> "EXISTS (SELECT 1 FROM " + t.quoted() + " WHERE "
                + (asStored ? column : printed) + " = :value)").collect(Collectors.joining(" OR "));
        if (h.createQuery("SELECT " + match).bind("value", v.successValue()).mapTo(Boolean.class).one()) {
            return;
        }
        List<String> seen = new ArrayList<>();
        for (TableName t : tables) {
            if (seen.size() >= FEW) {
                break;
            }
            seen.addAll(h.createQuery("SELECT DISTINCT " + printed + " FROM " + t.quoted() + " WHERE " + column
                    + " IS NOT NULL ORDER BY 1 LIMIT " + FEW).mapTo(String.class).list());
        }
        if (seen.isEmpty()) {
            return;
        }
        throw new ConfigException(key, "'" + v.successValue() + "' never occurs in column " + v.name() + " of any"
                + " wave, so its share would read 0% in every wave; values that do occur include "
                + seen.stream().distinct().limit(FEW).map(CatalogCheck::shown).toList());
    }

    /** A fixed baseline wave must be in the source, unless the source holds no wave yet. */
    private static void baselineExists(Handle h, WaveSource src, List<TableName> tables, String wave, String key) {
        if (src.onePerWave()) {
            TableName t;
            try {
                t = src.tableFor(wave);
            } catch (ConfigException e) {
                throw new ConfigException(key, "wave '" + wave + "' cannot name a table of the pattern: "
                        + e.problem());
            }
            if (!tables.contains(t)) {
                throw new ConfigException(key, "no wave '" + wave + "': table " + t + " does not exist");
            }
            return;
        }
        String wc = Identifiers.quote(src.waveColumn());
        String from = " FROM " + src.table().quoted();
        boolean found = h.createQuery("SELECT EXISTS (SELECT 1" + from + " WHERE " + wc + "::text = :wave)")
                .bind("wave", wave).mapTo(Boolean.class).one();
        if (found || !h.createQuery("SELECT EXISTS (SELECT 1" + from + ")").mapTo(Boolean.class).one()) {
            return;
        }
        List<String> waves = h.createQuery("SELECT DISTINCT " + wc + "::text" + from + " ORDER BY 1 LIMIT " + FEW)
                .mapTo(String.class).list();
        throw new ConfigException(key, "no wave '" + wave + "' in " + src.table() + "; waves there include " + waves);
    }

    private static final int FEW = 5;

    /** A value from the data, quoted and kept on one line (data never shapes the message). */
    private static String shown(String value) {
        String cut = value.length() > 40 ? value.substring(0, 40) + "..." : value;
        return "'" + cut.replaceAll("\\p{Cntrl}", "?") + "'";
    }

    /** A relationship's column must be read in the scan and hold numbers, or its correlation means nothing. */
    private static void monitoredNumber(DatasetConfig d, List<SourceColumn> columns, String key, String name) {
        SourceColumn c = columns.stream().filter(x -> x.name().equals(name)).findFirst().orElseThrow(() ->
                new ConfigException(key, "column " + name + " does not exist in the source table; it has "
                        + names(columns)));
        String why = name.equals(d.waveColumn()) ? "it is the wave column"
                : name.equals(d.weightColumn()) ? "it is the weight column"
                : d.exclude().contains(name) ? "it is listed in exclude"
                : d.isBookkeeping(name) ? "it is the respondent key, the release column or a design column" : null;
        if (why != null) {
            throw new ConfigException(key, "expected a monitored numeric column, but " + name + " is not monitored: "
                    + why);
        }
        if (!c.type().isNumeric()) {
            throw new ConfigException(key, "expected a numeric column (an INTEGER or DECIMAL type such as integer,"
                    + " numeric or double precision), but " + name + " is " + c.postgresType());
        }
    }

    /** The earlier publication must exist and carry the respondent key, or no respondent can be matched. */
    private static void verifyPreviousTable(Handle h, DatasetConfig d, String key) {
        WaveSource prev = WaveSource.previousPublication(d, key);
        String at = key + ".releases.previousTable";
        if (prev.onePerWave()) {
            String[] parts = prev.patternParts().orElseThrow();
            if (SourceCatalog.tablesMatching(h, parts[0], parts[1], parts[2]).isEmpty()) {
                throw new ConfigException(at, "no table in schema " + parts[0] + " matches "
                        + d.releases().previousTable());
            }
            return;
        }
        List<SourceColumn> columns = SourceCatalog.columns(h, prev.table());
        if (columns.isEmpty()) {
            throw new ConfigException(at, "table " + prev.table() + " does not exist in the source database (or this"
                    + " role cannot see it)");
        }
        for (String needed : new String[] {d.waveColumn(), d.respondentKey()}) {
            if (columns.stream().noneMatch(c -> c.name().equals(needed))) {
                throw new ConfigException(at, "table " + prev.table() + " has no column " + needed + "; the earlier"
                        + " publication needs the same layout; it has " + names(columns));
            }
        }
    }

    static String names(List<SourceColumn> columns) {
        List<String> n = columns.stream().map(SourceColumn::name).toList();
        return n.size() > 30 ? n.subList(0, 30) + "..." : n.toString();
    }
}
