package org.wavewarden.codebook;

import java.io.IOException;
import java.nio.file.Path;

/** Our CSV codebook format (documented in docs/codebook-csv.md), read as a {@link DatasetCodebook}. */
public final class CsvCodebook {

    private CsvCodebook() {
    }

    public static DatasetCodebook read(Path file) throws IOException {
        throw new UnsupportedOperationException("not written yet");
    }
}
