package org.wavewarden.load;

import org.wavewarden.load.CsvWaveImporter.CsvFormat;

import java.io.IOException;
import java.io.InputStream;
import java.io.StringReader;
import java.nio.ByteBuffer;
import java.nio.CharBuffer;
import java.nio.charset.Charset;
import java.nio.charset.CharsetDecoder;
import java.nio.charset.CoderResult;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * Guesses what the user did not say about a CSV file: its encoding (a byte order mark; else UTF-8 when the first
 * {@value #PREFIX_BYTES} bytes are valid UTF-8; else windows-1252, the superset of Latin-1 spreadsheets write) and
 * its delimiter (of {@code , ; tab |}, the one that splits the header and every sampled row into the same number of
 * fields, more than one). Every guess comes with its reason, for the line the import prints.
 */
final class CsvSniffer {

    static final int PREFIX_BYTES = 4 << 20;
    static final int SAMPLE_ROWS = 50;
    static final char[] DELIMITERS = {',', ';', '\t', '|'};
    static final Charset WINDOWS_1252 = Charset.forName("windows-1252");

    private CsvSniffer() {
    }

    /**
     * The format to read the file with, and what was guessed.
     *
     * @param encodingGuess why the encoding was taken, or null when the user gave it
     * @param guesses       the reasons of each guess, empty when the user gave both
     */
    record Sniffed(char delimiter, Charset encoding, String encodingGuess, List<String> guesses) {
    }

    static Sniffed sniff(Path csv, CsvFormat given) throws IOException {
        if (given.delimiter() != null && given.encoding() != null) {
            return new Sniffed(given.delimiter(), given.encoding(), null, List.of());
        }
        byte[] prefix;
        try (InputStream in = CsvWaveImporter.open(csv)) {
            prefix = in.readNBytes(PREFIX_BYTES);
        }
        boolean whole = prefix.length < PREFIX_BYTES;
        List<String> guesses = new ArrayList<>();
        Charset encoding = given.encoding();
        if (encoding == null) {
            encoding = guessEncoding(prefix, whole, guesses);
        }
        Character delimiter = given.delimiter();
        if (delimiter == null) {
            CharBuffer text = encoding.newDecoder().onMalformedInput(CodingErrorAction.REPLACE)
                    .onUnmappableCharacter(CodingErrorAction.REPLACE)
                    .decode(ByteBuffer.wrap(prefix, 0, Math.min(prefix.length, 1 << 20)));
            delimiter = guessDelimiter(text.toString(), whole && prefix.length <= 1 << 20, guesses);
        }
        return new Sniffed(delimiter, encoding, given.encoding() == null ? guesses.get(0) : null, guesses);
    }

    static Charset guessEncoding(byte[] b, boolean whole, List<String> guesses) {
        if (starts(b, 0xEF, 0xBB, 0xBF)) {
            guesses.add("a UTF-8 byte order mark");
            return StandardCharsets.UTF_8;
        }
        if (starts(b, 0xFF, 0xFE, 0, 0) || starts(b, 0, 0, 0xFE, 0xFF)) {
            guesses.add("a UTF-32 byte order mark");
            return Charset.forName("UTF-32");
        }
        if (starts(b, 0xFF, 0xFE) || starts(b, 0xFE, 0xFF)) {
            guesses.add("a UTF-16 byte order mark");
            return StandardCharsets.UTF_16;
        }
        CharsetDecoder d = StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
                .onUnmappableCharacter(CodingErrorAction.REPORT);
        ByteBuffer in = ByteBuffer.wrap(b);
        CharBuffer out = CharBuffer.allocate(8192);
        while (true) {
            CoderResult r = d.decode(in, out, whole);
            if (r.isOverflow()) {
                out.clear();
                continue;
            }
            if (r.isError()) {
                guesses.add("bytes at offset " + String.format(Locale.ROOT, "%,d", in.position()) + " are not UTF-8");
                return WINDOWS_1252;
            }
            break;
        }
        guesses.add(whole ? "the whole file is valid UTF-8"
                : "the first " + (PREFIX_BYTES >> 20) + " MB are valid UTF-8");
        return StandardCharsets.UTF_8;
    }

    private static boolean starts(byte[] b, int... head) {
        if (b.length < head.length) {
            return false;
        }
        for (int i = 0; i < head.length; i++) {
            if ((b[i] & 0xFF) != head[i]) {
                return false;
            }
        }
        return true;
    }

    /**
     * The delimiter giving the same number of fields (more than one) on the header and every sampled row; of
     * several, the one giving most fields, then the first of {@link #DELIMITERS}.
     *
     * @param whole whether {@code text} is the whole file (else its last, perhaps cut, row is not sampled)
     */
    static char guessDelimiter(String text, boolean whole, List<String> guesses) {
        char best = 0;
        int bestFields = 1;
        int bestRows = 0;
        char widest = ',';
        int widestHeader = 1;
        for (char d : DELIMITERS) {
            List<Integer> counts = counts(text, d, whole);
            if (counts.isEmpty()) {
                continue;
            }
            int header = counts.get(0);
            if (header > widestHeader) {
                widest = d;
                widestHeader = header;
            }
            boolean same = counts.stream().allMatch(n -> n == header);
            if (same && header > bestFields) {
                best = d;
                bestFields = header;
                bestRows = counts.size() - 1;
            }
        }
        if (best != 0) {
            guesses.add(show(best) + " gives " + bestFields + " fields on the header and each of the " + bestRows
                    + " rows sampled");
            return best;
        }
        if (widestHeader > 1) {
            guesses.add("no delimiter gives the same number of fields on every sampled row; " + show(widest)
                    + " splits the header into " + widestHeader);
            return widest;
        }
        guesses.add("no delimiter splits the header, so the file has one column");
        return ',';
    }

    /** Fields per record of the sample: the header first, then up to {@link #SAMPLE_ROWS} rows. */
    private static List<Integer> counts(String text, char d, boolean whole) {
        List<Integer> counts = new ArrayList<>();
        CsvParser p = new CsvParser(new StringReader(text), d);
        List<String> fields = new ArrayList<>();
        try {
            while (counts.size() <= SAMPLE_ROWS && p.next(fields)) {
                boolean blank = fields.size() == 1 && fields.get(0) == null;
                if (!blank) {
                    counts.add(fields.size());
                }
            }
        } catch (IOException e) {
            // A quote left open by the cut sample, or a row the import will refuse: the rows read so far decide.
        }
        if (!whole && counts.size() > 1 && counts.size() <= SAMPLE_ROWS) {
            counts.remove(counts.size() - 1);
        }
        return counts;
    }

    /** A delimiter as the user would type it. */
    static String show(char d) {
        return d == '\t' ? "tab" : "'" + d + "'";
    }
}
