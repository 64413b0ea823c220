package org.wavewarden.codebook;

import java.io.IOException;
import java.nio.file.Path;

/**
 * A codebook file that cannot be read as its format says, with where: the file, the line (and column when known)
 * and the element or column at fault, so the user can open the file at that place.
 */
public final class CodebookFormatException extends IOException {
    private static final long serialVersionUID = 1L;

    private final int line;

    public CodebookFormatException(Path file, int line, int column, String where, String problem) {
        super(file.getFileName() + ", line " + line + (column > 0 ? ", column " + column : "")
                + (where == null ? "" : ", " + where) + ": " + problem);
        this.line = line;
    }

    /** The line of the file at fault (1-based). */
    public int line() {
        return line;
    }
}
