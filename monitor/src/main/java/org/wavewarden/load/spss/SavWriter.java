package org.wavewarden.load.spss;

import org.wavewarden.codebook.DatasetCodebook;

import java.io.IOException;
import java.nio.file.Path;

/** Writes an SPSS system file from a codebook and its cases. */
public final class SavWriter {

    /** How the cases are stored: as they are, bytecode-compressed (.sav), or zlib-compressed (.zsav). */
    public enum Compression { NONE, BYTECODE, ZLIB }

    private SavWriter() {
    }

    /**
     * Writes {@code cases} (values as {@link org.wavewarden.load.CaseSource#next} gives them, in the codebook's
     * variable order) with the codebook's variable labels, value labels, missing values and ranges, measurement
     * levels and formats, in UTF-8.
     */
    public static void write(Path file, DatasetCodebook codebook, Iterable<Object[]> cases, Compression compression)
            throws IOException {
        throw new UnsupportedOperationException("not written yet");
    }
}
