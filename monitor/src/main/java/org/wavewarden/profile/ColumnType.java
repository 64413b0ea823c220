package org.wavewarden.profile;

/** The broad storage class of a source column, from the PostgreSQL catalog. */
public enum ColumnType {
    TEXT, INTEGER, DECIMAL, BOOLEAN, DATE, TIMESTAMP, OTHER;

    /** Maps a PostgreSQL type name as {@code format_type} or {@code information_schema.columns.data_type} gives it. */
    public static ColumnType ofPostgresType(String typeName) {
        String t = typeName.toLowerCase(java.util.Locale.ROOT);
        if (t.startsWith("character") || t.startsWith("varchar") || t.equals("text") || t.startsWith("char")
                || t.equals("bpchar") || t.equals("name") || t.equals("citext")) {
            return TEXT;
        }
        if (t.equals("smallint") || t.equals("integer") || t.equals("bigint") || t.equals("int2") || t.equals("int4")
                || t.equals("int8")) {
            return INTEGER;
        }
        if (t.startsWith("numeric") || t.startsWith("decimal") || t.equals("real") || t.startsWith("double")
                || t.equals("float4") || t.equals("float8")) {
            return DECIMAL;
        }
        if (t.equals("boolean") || t.equals("bool")) {
            return BOOLEAN;
        }
        if (t.equals("date")) {
            return DATE;
        }
        if (t.startsWith("timestamp")) {
            return TIMESTAMP;
        }
        return OTHER;
    }

    public boolean isNumeric() {
        return this == INTEGER || this == DECIMAL;
    }
}
