package org.wavewarden.load;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

import java.nio.charset.Charset;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;

/** The delimiter and encoding guessed from a file's first bytes, each with the reason printed. */
class CsvSnifferTest {

    /** Rows: the sample with '/' for a line break, the delimiter expected, the reason expected. */
    @ParameterizedTest(name = "{0}")
    @CsvSource(delimiter = '!', quoteCharacter = '`', value = {
        "a,b,c/1,2,3/4,5,6 ! , ! ',' gives 3 fields on the header and each of the 2 rows sampled",
        "a;b/1,5;2,5/3,0;4,1 ! ; ! ';' gives 2 fields on the header and each of the 2 rows sampled",
        "a|b|c/1|x,y|3 ! | ! '|' gives 3 fields on the header and each of the 1 rows sampled",
        "a;b;c/\"x;y\";2;3 ! ; ! ';' gives 3 fields on the header and each of the 1 rows sampled",
        "a,b;c;d/1,2;3;4/5;6;7 ! ; ! ';' gives 3 fields on the header and each of the 2 rows sampled",
        "a,b,c/1,2/3,4,5 ! , ! no delimiter gives the same number of fields on every sampled row; ',' splits the"
                + " header into 3",
        "only/1/2 ! , ! no delimiter splits the header, so the file has one column",
    })
    void theDelimiterGivingTheSameFieldCountOnEverySampledLineIsChosen(String sample, String expected,
                                                                        String reason) {
        List<String> guesses = new ArrayList<>();
        char d = CsvSniffer.guessDelimiter(sample.replace('/', '\n') + "\n", true, guesses);
        assertEquals(expected.charAt(0), d);
        assertEquals(List.of(reason), guesses);
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource(delimiter = '!', quoteCharacter = '`', value = {
        "EF BB BF 61 ! UTF-8 ! a UTF-8 byte order mark",
        "FF FE 61 00 ! UTF-16 ! a UTF-16 byte order mark",
        "FE FF 00 61 ! UTF-16 ! a UTF-16 byte order mark",
        "61 C3 A9 62 ! UTF-8 ! the whole file is valid UTF-8",
        "61 62 E9 63 ! windows-1252 ! bytes at offset 2 are not UTF-8",
    })
    void theEncodingComesFromAByteOrderMarkElseFromWhetherTheBytesAreUtf8(String hex, String expected,
                                                                         String reason) {
        String[] parts = hex.split(" ");
        byte[] b = new byte[parts.length];
        for (int i = 0; i < parts.length; i++) {
            b[i] = (byte) Integer.parseInt(parts[i], 16);
        }
        List<String> guesses = new ArrayList<>();
        Charset c = CsvSniffer.guessEncoding(b, true, guesses);
        assertEquals(expected, c.name());
        assertEquals(List.of(reason), guesses);
    }

    @org.junit.jupiter.api.Test
    void aUtf8CharacterCutAtTheEndOfTheSampledPrefixIsNotTakenForABadByte() {
        byte[] b = "ab\u00e9".getBytes(StandardCharsets.UTF_8);
        byte[] cut = java.util.Arrays.copyOf(b, b.length - 1);
        List<String> guesses = new ArrayList<>();
        assertEquals(StandardCharsets.UTF_8, CsvSniffer.guessEncoding(cut, false, guesses));
        assertEquals(List.of("the first 4 MB are valid UTF-8"), guesses);
    }
}
