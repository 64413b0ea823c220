package org.wavewarden.load;

import org.wavewarden.config.ConfigException;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.Identifiers.TableName;

import java.io.IOException;
import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.util.List;

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

    /** Serialises imports of one wave into one table until the transaction ends. */
    public static void lockWave(Connection c, TableName table, String wave) throws SQLException {
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
            throw new ConfigException("--wave", "wave '" + wave + "' already has " + existing + " rows in " + table
                    + "; pass --replace to load it again");
        }
        return existing;
    }

    /**
     * Replaces the wave's rows with the staging table's: deletes the old ones when there are any, then inserts the
     * named columns with the wave label, cast on the server to the wave column's own type.
     *
     * @param staging    a temporary table holding {@code columns}
     * @param columns    the columns to copy, named alike in both tables; the wave column is not among them
     * @param waveType   the wave column's type as {@code format_type} prints it (from the catalog, not from data)
     * @param whatRows   names the rows in a refusal ("the rows of household.sav")
     * @return the rows inserted
     */
    public static long replaceWave(Connection c, TableName table, String waveColumn, String wave, long existing,
                                   String staging, List<String> columns, String waveType, String whatRows)
            throws SQLException {
        try (PreparedStatement ps = c.prepareStatement("SELECT CAST(? AS " + waveType + ")")) {
            ps.setString(1, wave);
            ps.execute();
        } catch (SQLException e) {
            if (CsvWaveImporter.isBadInput(e)) {
                throw new ConfigException("--wave", "'" + org.wavewarden.deliver.DataText.visible(wave) + "' is not a"
                        + " value the wave column " + waveColumn + " can hold: " + CsvWaveImporter.serverMessage(e));
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
        String cols = String.join(", ", columns.stream().map(Identifiers::quote).toList());
        String sep = columns.isEmpty() ? "" : ", ";
        // INSERT ... SELECT would resolve a bare parameter to text, which an integer or date wave column refuses.
        String sql = "INSERT INTO " + table.quoted() + " (" + cols + sep + Identifiers.quote(waveColumn) + ") SELECT "
                + cols + sep + "CAST(? AS " + waveType + ") FROM " + Identifiers.quote(staging);
        try (PreparedStatement ps = c.prepareStatement(sql)) {
            ps.setString(1, wave);
            return ps.executeUpdate();
        } catch (SQLException e) {
            if (CsvWaveImporter.isBadInput(e)) {
                throw new CsvWaveImporter.ImportRefusedException(whatRows + " do not fit " + table + ": "
                        + CsvWaveImporter.serverMessage(e) + "; nothing was imported");
            }
            throw e;
        }
    }
}
