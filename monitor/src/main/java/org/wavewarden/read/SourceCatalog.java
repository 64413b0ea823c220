package org.wavewarden.read;

import org.jdbi.v3.core.Handle;
import org.wavewarden.config.Identifiers.TableName;
import org.wavewarden.profile.ColumnType;

import java.util.List;

/** Reads table and column descriptions from the PostgreSQL catalog, with bound parameters only. */
public final class SourceCatalog {

    private SourceCatalog() {
    }

    public static boolean tableExists(Handle h, TableName t) {
        return h.createQuery("""
                        SELECT count(*) FROM pg_catalog.pg_class c
                        JOIN pg_catalog.pg_namespace n ON n.oid = c.relnamespace
                        WHERE n.nspname = :schema AND c.relname = :table AND c.relkind IN ('r', 'p', 'v', 'm', 'f')
                        """)
                .bind("schema", t.schema()).bind("table", t.table())
                .mapTo(Long.class).one() > 0;
    }

    /** Columns in table order; empty when the table does not exist. */
    public static List<SourceColumn> columns(Handle h, TableName t) {
        return h.createQuery("""
                        SELECT a.attname AS name, pg_catalog.format_type(a.atttypid, NULL) AS type
                        FROM pg_catalog.pg_attribute a
                        JOIN pg_catalog.pg_class c ON c.oid = a.attrelid
                        JOIN pg_catalog.pg_namespace n ON n.oid = c.relnamespace
                        WHERE n.nspname = :schema AND c.relname = :table AND a.attnum > 0 AND NOT a.attisdropped
                        ORDER BY a.attnum
                        """)
                .bind("schema", t.schema()).bind("table", t.table())
                .map((rs, ctx) -> new SourceColumn(rs.getString("name"), ColumnType.ofPostgresType(rs.getString("type")),
                        rs.getString("type")))
                .list();
    }

    /** Tables in a schema whose names start and end with the given fixed parts (for one-table-per-wave sources). */
    public static List<String> tablesMatching(Handle h, String schema, String prefix, String suffix) {
        return h.createQuery("""
                        SELECT c.relname FROM pg_catalog.pg_class c
                        JOIN pg_catalog.pg_namespace n ON n.oid = c.relnamespace
                        WHERE n.nspname = :schema AND c.relkind IN ('r', 'p', 'v', 'm', 'f')
                          AND left(c.relname, length(:prefix)) = :prefix
                          AND right(c.relname, length(:suffix)) = :suffix
                          AND length(c.relname) > length(:prefix) + length(:suffix)
                        ORDER BY c.relname
                        """)
                .bind("schema", schema).bind("prefix", prefix).bind("suffix", suffix)
                .mapTo(String.class).list();
    }
}
