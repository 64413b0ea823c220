package org.wavewarden.store;

import org.flywaydb.core.Flyway;
import org.flywaydb.core.api.output.MigrateResult;

import javax.sql.DataSource;

/** Applies the versioned results schema (sql/results in the repository) with Flyway; safe to run again. */
public final class ResultsSchema {

    private ResultsSchema() {
    }

    public static MigrateResult migrate(DataSource ds, String schema) {
        return flyway(ds, schema).migrate();
    }

    /**
     * How many versions of the results schema this build has that the database lacks; all of them when the schema
     * was never made. Zero for a schema a reader of it (the console) can use as it is; nothing is changed.
     */
    public static int pending(DataSource ds, String schema) {
        return flyway(ds, schema).info().pending().length;
    }

    private static Flyway flyway(DataSource ds, String schema) {
        return Flyway.configure()
                .dataSource(ds)
                .schemas(schema)
                .defaultSchema(schema)
                .createSchemas(true)
                .locations("classpath:db/results")
                .table("schema_history")
                .load();
    }
}
