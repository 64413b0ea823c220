package org.wavewarden.pipeline;

import org.jdbi.v3.core.Handle;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.RelationshipConfig;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.read.SourceCatalog;
import org.wavewarden.read.SourceColumn;
import org.wavewarden.read.WaveSource;

import java.util.List;

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
        if (src.onePerWave()) {
            String[] parts = src.patternParts().orElseThrow();
            List<String> tables = SourceCatalog.tablesMatching(h, parts[0], parts[1], parts[2]);
            if (tables.isEmpty()) {
                throw new ConfigException(key + ".tablePattern", "no table in schema " + parts[0] + " matches "
                        + d.tablePattern());
            }
            columns = SourceCatalog.columns(h, src.tableFor(tables.get(tables.size() - 1)
                    .substring(parts[1].length(), tables.get(tables.size() - 1).length() - parts[2].length())));
        } else {
            if (!SourceCatalog.tableExists(h, src.table())) {
                throw new ConfigException(key + ".table", "table " + src.table() + " does not exist in the source"
                        + " database (or this role cannot see it)");
            }
            columns = SourceCatalog.columns(h, src.table());
            if (columns.stream().noneMatch(c -> c.name().equals(d.waveColumn()))) {
                throw new ConfigException(key + ".waveColumn", "column " + d.waveColumn() + " does not exist in "
                        + src.table() + "; it has " + names(columns));
            }
        }
        for (int j = 0; j < d.variables().size(); j++) {
            String name = d.variables().get(j).name();
            if (columns.stream().noneMatch(c -> c.name().equals(name))) {
                throw new ConfigException(key + ".variables[" + j + "].name", "column " + name + " does not exist in"
                        + " the source table; it has " + names(columns));
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
        if (d.weightColumn() != null && columns.stream().noneMatch(c -> c.name().equals(d.weightColumn()))) {
            throw new ConfigException(key + ".weightColumn", "column " + d.weightColumn() + " does not exist in the"
                    + " source table; it has " + names(columns));
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
