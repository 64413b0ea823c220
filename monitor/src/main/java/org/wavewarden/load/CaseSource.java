package org.wavewarden.load;

import org.wavewarden.codebook.DatasetCodebook;

import java.io.Closeable;
import java.io.IOException;

/**
 * The cases of one wave from a file that carries its own codebook (an SPSS system file), read one at a time so a
 * large wave never sits in memory.
 */
public interface CaseSource extends Closeable {

    /** The file's dictionary: one entry per variable, in the order {@link #next} fills values. */
    DatasetCodebook codebook();

    /**
     * Reads the next case. Each value is a {@code Double} (numbers), a {@code String} (text, trailing blanks of the
     * fixed width removed), a {@code java.time.LocalDate} (dates), a {@code java.time.LocalDateTime} (date-times),
     * or null for a system-missing value. User-missing values are returned as they are: declaring them is the
     * codebook's job, not the reader's.
     *
     * @return false when there is no further case
     */
    boolean next(Object[] values) throws IOException;
}
