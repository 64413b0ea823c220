package org.wavewarden.load;

import org.postgresql.util.PSQLException;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.Identifiers.TableName;
import org.wavewarden.deliver.DataText;

import java.io.IOException;
import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Savepoint;
import java.util.List;
import java.util.Map;

/**
 * The steps every import of one wave shares, whatever the file: one transaction that leaves nothing behind when
 * anything fails, a transaction-level advisory lock on table and wave (so of two concurrent imports of one wave the
 * second sees the first one's rows), the refusal to load a wave twice without {@code --replace}, and the insert
 * from a staging table that names its columns so the table's own defaults fill the others.
 */
public final class WaveLoad {

    private WaveLoad() {
    }

    /** Work done inside the import's transaction. */
    @FunctionalInterface
    public interface Work<T> {
        T run() throws SQLException, IOException;
    }

    /** Runs {@code work} in one transaction: committed when it returns, rolled back when it throws. */
    public static <T> T inOneTransaction(Connection c, Work<T> work) throws SQLException, IOException {
        boolean autoCommit = c.getAutoCommit();
        c.setAutoCommit(false);
        try {
            T out = work.run();
            c.commit();
            return out;
        } catch (SQLException | IOException | RuntimeException e) {
            c.rollback();
            throw e;
        } finally {
            c.setAutoCommit(autoCommit);
        }
    }

    /**
     * Takes the wave's lock and finds the table the wave goes into: when it does not exist and {@code create} is set,
     * also the table-creation lock, after which the table is looked up again (another import may have created it
     * while this one waited). Every import takes the wave's lock first and the creation lock second, so no two wait
     * for each other.
     *
     * @return the table's columns and their types; empty when the table is still to be created
     * @throws ConfigException with key {@code table} when the table does not exist and {@code create} is not set,
     *                         or {@code waveColumn} when it exists without the wave column
     */
    public static Map<String, String> lockWaveAndFindTable(Connection c, TableName table, String waveColumn,
                                                           String wave, boolean create) throws SQLException {
        lockWave(c, table, wave);
        Map<String, String> have = TableShape.existing(c, table);
        if (have.isEmpty()) {
            if (!create) {
                // TableShape's refusal of a missing table, before a single row is read.
                TableShape.ensure(c, table, waveColumn, List.of(), false);
            }
            lockTableCreation(c, table);
            have = TableShape.existing(c, table);
        }
        if (!have.isEmpty() && !have.containsKey(waveColumn)) {
            throw new ConfigException("waveColumn", "table " + table + " has no column " + waveColumn);
        }
        return have;
    }

    /** Serialises imports of one wave into one table until the transaction ends. */
    static void lockWave(Connection c, TableName table, String wave) throws SQLException {
        try (PreparedStatement ps = c.prepareStatement("SELECT pg_advisory_xact_lock(hashtext(?), hashtext(?))")) {
            ps.setString(1, "wavewarden import " + table.quoted());
            ps.setString(2, wave);
            ps.execute();
        }
    }

    /**
     * Serialises the creation of one table: two imports of different waves into a table that does not exist yet
     * would otherwise both try to create it, and the second would fail on the catalog instead of finding the table.
     */
    public static void lockTableCreation(Connection c, TableName table) throws SQLException {
        try (PreparedStatement ps = c.prepareStatement("SELECT pg_advisory_xact_lock(hashtext(?), 0)")) {
            ps.setString(1, "wavewarden create " + table.quoted());
            ps.execute();
        }
    }

    /**
     * The wave's rows already in the table; refused unless {@code replace} when there are any.
     *
     * @throws ConfigException with key {@code --wave} when the wave has rows and {@code replace} is not set
     */
    public static long existingRows(Connection c, TableName table, String waveColumn, String wave, boolean replace)
            throws SQLException {
        long existing;
        try (PreparedStatement ps = c.prepareStatement("SELECT count(*) FROM " + table.quoted() + " WHERE "
                + Identifiers.quote(waveColumn) + "::text = ?")) {
            ps.setString(1, wave);
            try (ResultSet rs = ps.executeQuery()) {
                rs.next();
                existing = rs.getLong(1);
            }
        }
        if (existing > 0 && !replace) {
            throw new ConfigException("--wave", "wave '" + DataText.visible(wave) + "' already has " + existing
                    + " rows in " + table + "; pass --replace to load it again");
        }
        return existing;
    }

    /**
     * A column of the table filled from the staging table.
     *
     * @param column the table's column
     * @param from   the SQL expression over the staging table's columns that gives its values
     */
    public record Filled(String column, String from) {
        /** A column the staging table holds under the same name and in the type it needs. */
        public static Filled same(String column) {
            return new Filled(column, Identifiers.quote(column));
        }
    }

    /** What to say when the server refuses the staged rows for the table; the staging table can still be read. */
    @FunctionalInterface
    public interface BadRows {
        RuntimeException refusal(SQLException e) throws SQLException;
    }

    /** The refusal that names only the rows and the server's reason. */
    public static BadRows doNotFit(String whatRows, TableName table) {
        return e -> new CsvWaveImporter.ImportRefusedException(whatRows + " do not fit " + table + ": "
                + serverMessage(e) + "; nothing was imported");
    }

    /**
     * Replaces the wave's rows with the staging table's: checks that the wave column can hold the label, deletes
     * the old rows when there are any, then inserts the named columns with the wave label, cast on the server to the
     * wave column's own type. Naming the columns lets the table's own defaults fill any the file does not have.
     *
     * @param staging  a temporary table
     * @param columns  the columns to fill; the wave column is not among them
     * @param waveType the wave column's type as {@code format_type} prints it (from the catalog, not from data)
     * @param badRows  the refusal when the server takes a row for bad input (a value out of a column's range, a
     *                 constraint); called after rolling back to just before the insert
     * @return the rows inserted
     * @throws ConfigException with key {@code --wave} when the wave column cannot hold the label
     */
    public static long replaceWave(Connection c, TableName table, String waveColumn, String wave, long existing,
                                   String staging, List<Filled> columns, String waveType, BadRows badRows)
            throws SQLException {
        try (PreparedStatement ps = c.prepareStatement("SELECT CAST(? AS " + waveType + ")")) {
            ps.setString(1, wave);
            ps.execute();
        } catch (SQLException e) {
            if (isBadInput(e)) {
                throw new ConfigException("--wave", "'" + DataText.visible(wave) + "' is not a value the wave column "
                        + waveColumn + " can hold: " + serverMessage(e));
            }
            throw e;
        }
        if (existing > 0) {
            try (PreparedStatement ps = c.prepareStatement("DELETE FROM " + table.quoted() + " WHERE "
                    + Identifiers.quote(waveColumn) + "::text = ?")) {
                ps.setString(1, wave);
                ps.executeUpdate();
            }
        }
        String cols = String.join(", ", columns.stream().map(f -> Identifiers.quote(f.column())).toList());
        String from = String.join(", ", columns.stream().map(Filled::from).toList());
        String sep = columns.isEmpty() ? "" : ", ";
        // INSERT ... SELECT would resolve a bare parameter to text, which an integer or date wave column refuses.
        String sql = "INSERT INTO " + table.quoted() + " (" + cols + sep + Identifiers.quote(waveColumn) + ") SELECT "
                + from + sep + "CAST(? AS " + waveType + ") FROM " + Identifiers.quote(staging);
        Savepoint beforeInsert = c.setSavepoint();
        try (PreparedStatement ps = c.prepareStatement(sql)) {
            ps.setString(1, wave);
            return ps.executeUpdate();
        } catch (SQLException e) {
            if (isBadInput(e)) {
                c.rollback(beforeInsert);
                throw badRows.refusal(e);
            }
            throw e;
        }
    }

    /** Data exceptions (class 22) and integrity violations (class 23): the file's content, not the server, is wrong. */
    static boolean isBadInput(SQLException e) {
        String state = e.getSQLState();
        return state != null && (state.startsWith("22") || state.startsWith("23"));
    }

    /** The server's own sentence, with data in it made visible and cut short. */
    static String serverMessage(SQLException e) {
        String m = e instanceof PSQLException p && p.getServerErrorMessage() != null
                && p.getServerErrorMessage().getMessage() != null ? p.getServerErrorMessage().getMessage()
                : e.getClass().getSimpleName();
        String shown = DataText.visible(m);
        return shown.length() > 300 ? shown.substring(0, 300) + "..." : shown;
    }
}
