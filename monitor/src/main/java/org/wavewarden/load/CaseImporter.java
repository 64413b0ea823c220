package org.wavewarden.load;

import org.wavewarden.config.Identifiers.TableName;

import java.io.IOException;
import java.io.PrintWriter;
import java.sql.Connection;
import java.sql.SQLException;

/** Loads one wave from a {@link CaseSource} (an SPSS system file) into a source table, in one transaction. */
public final class CaseImporter {

    private CaseImporter() {
    }

    /**
     * @param create create the table from the file's dictionary when it does not exist
     * @param notes  receives what was decided (types, created table); may be null
     */
    public static CsvWaveImporter.Imported load(Connection c, TableName table, String waveColumn, String wave,
                                                CaseSource cases, boolean replace, boolean create, PrintWriter notes)
            throws SQLException, IOException {
        throw new UnsupportedOperationException("not written yet");
    }
}
