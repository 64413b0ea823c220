package org.wavewarden.codebook;

import java.io.IOException;
import java.io.Writer;
import java.nio.file.Path;

/** DDI-Codebook 2.5 XML: read as a {@link DatasetCodebook}, and written from one. */
public final class DdiCodebook {

    private DdiCodebook() {
    }

    /**
     * Reads a DDI-Codebook 2.5 document (older ones without a namespace too) as described in {@link DdiReader}.
     *
     * @throws CodebookFormatException when the file is not such a document, naming the line and element at fault
     */
    public static DatasetCodebook read(Path file) throws IOException {
        return DdiReader.read(file);
    }

    /** Writes a DDI-Codebook 2.5 document (one file description, one {@code var} per variable). */
    public static void write(DatasetCodebook codebook, Writer out) throws IOException {
        throw new UnsupportedOperationException("not written yet");
    }
}
