package org.wavewarden.load.spss;

import java.io.IOException;

/**
 * An SPSS system file that does not follow the format: damaged, truncated, or not a system file at all. The message
 * names the file, the record being read and the byte offset, so a person can tell a broken delivery from a bug.
 */
public final class SavFormatException extends IOException {

    private final String file;
    private final String record;
    private final long offset;
    private final String problem;

    SavFormatException(String file, String record, long offset, String problem) {
        super(file + ": " + problem + " (" + record + ", byte offset " + offset + ")");
        this.file = file;
        this.record = record;
        this.offset = offset;
        this.problem = problem;
    }

    /** The same failure, said to have happened while reading the given case. */
    SavFormatException inCase(long caseNumber) {
        SavFormatException e = new SavFormatException(file, "case " + caseNumber + ", " + record, offset, problem);
        e.initCause(getCause());
        return e;
    }

    SavFormatException(String file, String record, long offset, String problem, Throwable cause) {
        this(file, record, offset, problem);
        initCause(cause);
    }

    /** Where in the file the reader was when it gave up. */
    public long offset() {
        return offset;
    }
}
