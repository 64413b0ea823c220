package org.wavewarden.bench;

import org.jdbi.v3.core.statement.SqlLogger;
import org.jdbi.v3.core.statement.StatementContext;
import org.wavewarden.pipeline.WaveJudge;

import java.sql.SQLException;
import java.util.concurrent.atomic.AtomicInteger;

/**
 * Counts what a check sends to the source: every Jdbi statement (set as the source Jdbi's {@link SqlLogger}),
 * split into those naming the source table (each a pass over the table) and catalog look-ups, plus the wave scans,
 * each of which sends two statements on the raw connection ({@code SET DateStyle} and one {@code COPY}).
 */
public final class StatementCounter implements SqlLogger {

    private final String tableText;
    private final AtomicInteger tableQueries = new AtomicInteger();
    private final AtomicInteger otherQueries = new AtomicInteger();
    private final AtomicInteger copies = new AtomicInteger();

    /** @param quotedTable the source table as the SQL names it, e.g. {@code "bench"."survey"} */
    public StatementCounter(String quotedTable) {
        if (quotedTable == null || quotedTable.isBlank()) {
            throw new IllegalArgumentException("quotedTable must name the source table");
        }
        this.tableText = quotedTable;
    }

    /** What one check sent to the source. */
    public record SourceStatements(int tableQueries, int catalogQueries, int copies, int rawStatements) {

        /** Passes over source rows: each COPY and each query naming the table. */
        public int scans() {
            return copies + tableQueries;
        }

        public int total() {
            return tableQueries + catalogQueries + rawStatements;
        }
    }

    @Override
    public void logBeforeExecution(StatementContext context) {
        String sql = context.getRenderedSql();
        (sql != null && sql.contains(tableText) ? tableQueries : otherQueries).incrementAndGet();
    }

    @Override
    public void logException(StatementContext context, SQLException ex) {
        // counted before execution already
    }

    /** The scanner, counting its passes. */
    public WaveJudge.Scanner counting(WaveJudge.Scanner inner) {
        return (h, source, wave, columns, weight, design, pairs, domains, progress) -> {
            copies.incrementAndGet();
            return inner.scan(h, source, wave, columns, weight, design, pairs, domains, progress);
        };
    }

    public void reset() {
        tableQueries.set(0);
        otherQueries.set(0);
        copies.set(0);
    }

    public SourceStatements snapshot() {
        return new SourceStatements(tableQueries.get(), otherQueries.get(), copies.get(), 2 * copies.get());
    }
}
