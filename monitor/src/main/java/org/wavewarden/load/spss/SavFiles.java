package org.wavewarden.load.spss;

import org.wavewarden.load.CaseSource;

import java.io.IOException;
import java.nio.file.Path;

/** Opens an SPSS system file (.sav, compressed .sav, .zsav) for reading. */
public final class SavFiles {

    private SavFiles() {
    }

    /** The file's dictionary and cases; the caller closes it. */
    public static CaseSource open(Path file) throws IOException {
        throw new UnsupportedOperationException("not written yet");
    }
}
