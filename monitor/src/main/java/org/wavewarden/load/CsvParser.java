package org.wavewarden.load;

import java.io.IOException;
import java.io.Reader;
import java.util.List;
import java.util.Locale;

/**
 * Splits CSV text into records the way PostgreSQL's {@code COPY ... (FORMAT csv)} reads them (a quote anywhere
 * opens quoting, {@code ""} inside quotes is one quote, an unquoted empty field is NULL and a quoted one an empty
 * string), and keeps the physical line each record starts on, so that a message about a record names the line an
 * editor shows even after a quoted field has spanned lines. Lines may end in LF, CRLF or CR. A NUL character and
 * an unclosed quote are refused with their line and field.
 */
final class CsvParser implements AutoCloseable {

    /**
     * A record the file's author must fix.
     *
     * @param line   the physical line (1-based)
     * @param column the 1-based field, or 0 when the problem is not in one field
     */
    static final class BadRowException extends IOException {
        private static final long serialVersionUID = 1L;

        final long line;
        final int column;

        BadRowException(long line, int column, String problem, Throwable cause) {
            super(problem, cause);
            this.line = line;
            this.column = column;
        }
    }

    private static final int EOF = -1;

    private final Reader in;
    private final char delimiter;
    private final char[] buf = new char[1 << 16];
    private int pos;
    private int len;
    private long line = 1;
    private long recordLine;
    private boolean first = true;
    private final StringBuilder field = new StringBuilder();

    CsvParser(Reader in, char delimiter) {
        this.in = in;
        this.delimiter = delimiter;
    }

    /** The physical line the last record returned by {@link #next} starts on. */
    long recordLine() {
        return recordLine;
    }

    /** The line being read now (after {@link #next} returned false: one past the last line). */
    long line() {
        return line;
    }

    private int read(List<String> fields) throws IOException {
        if (pos == len) {
            try {
                len = in.read(buf, 0, buf.length);
            } catch (DecodingReader.MalformedBytesException e) {
                throw new BadRowException(line, fields.size() + 1, "bytes " + e.bytes + " at byte offset "
                        + String.format(Locale.ROOT, "%,d", e.offset), e);
            }
            pos = 0;
            if (len <= 0) {
                len = 0;
                return EOF;
            }
        }
        return buf[pos++];
    }

    private int peek(List<String> fields) throws IOException {
        int c = read(fields);
        if (c != EOF) {
            pos--;
        }
        return c;
    }

    /**
     * Reads the next record into {@code fields} (cleared first): each value, or null for an unquoted empty field.
     *
     * @return false at the end of the file (a final line break does not start another record)
     */
    boolean next(List<String> fields) throws IOException {
        fields.clear();
        field.setLength(0);
        recordLine = line;
        boolean quoted = false;
        boolean inQuotes = false;
        long quoteLine = 0;
        boolean any = false;
        while (true) {
            int c = read(fields);
            if (first) {
                first = false;
                if (c == '\uFEFF') {
                    continue;
                }
            }
            if (inQuotes) {
                if (c == EOF) {
                    throw new BadRowException(quoteLine, fields.size() + 1, "a quoted field opened on line "
                            + quoteLine + " is not closed before the end of the file", null);
                } else if (c == '"') {
                    if (peek(fields) == '"') {
                        read(fields);
                        field.append('"');
                    } else {
                        inQuotes = false;
                    }
                } else if (c == 0) {
                    throw nul(fields);
                } else {
                    if (c == '\n' || (c == '\r' && peek(fields) != '\n')) {
                        line++;
                    }
                    field.append((char) c);
                }
                continue;
            }
            if (c == EOF) {
                if (!any) {
                    return false;
                }
                fields.add(quoted || field.length() > 0 ? field.toString() : null);
                return true;
            }
            any = true;
            if (c == '"') {
                inQuotes = true;
                quoted = true;
                quoteLine = line;
            } else if (c == delimiter) {
                fields.add(quoted || field.length() > 0 ? field.toString() : null);
                field.setLength(0);
                quoted = false;
            } else if (c == '\n' || c == '\r') {
                if (c == '\r' && peek(fields) == '\n') {
                    read(fields);
                }
                fields.add(quoted || field.length() > 0 ? field.toString() : null);
                line++;
                return true;
            } else if (c == 0) {
                throw nul(fields);
            } else {
                field.append((char) c);
            }
        }
    }

    @Override
    public void close() throws IOException {
        in.close();
    }

    private BadRowException nul(List<String> fields) {
        return new BadRowException(line, fields.size() + 1, "a NUL byte (0x00) is in the value; a database text"
                + " value cannot hold it", null);
    }
}
