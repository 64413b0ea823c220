package org.wavewarden.load.spss;

import java.io.IOException;
import java.nio.file.Path;

/** Opens an SPSS system file (.sav, compressed .sav, .zsav) for reading. */
public final class SavFiles {

    private SavFiles() {
    }

    /**
     * The file's dictionary and cases; the caller closes it. A damaged or truncated file fails with a
     * {@link SavFormatException} naming the file, the record and the byte offset.
     */
    public static SavReader open(Path file) throws IOException {
        return SavReader.open(file);
    }
}
