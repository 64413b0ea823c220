package org.wavewarden.load;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.wavewarden.testing.CliRun;

import java.io.ByteArrayOutputStream;
import java.io.OutputStream;
import java.nio.charset.Charset;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.Locale;
import java.util.zip.GZIPOutputStream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A CSV file as it is delivered (any delimiter, any encoding, headers in any case) is imported through the command
 * line, with the guess printed; every row it cannot load is refused with exit 2, naming the file, the line an
 * editor shows and the column's number and name.
 */
class CsvFormatImportTest extends SmallSurveyImportTest {

    static final String HEADER = "respondent_id,score,region,satisfied,has_car,remark,spread\n";
    static final Charset WINDOWS_1252 = Charset.forName("windows-1252");

    CsvFormatImportTest() {
        super("csvformat");
    }

    CliRun importWave(Path csv, String... options) {
        return importWave("w1", csv, options);
    }

    static byte[] concat(byte[]... parts) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        for (byte[] p : parts) {
            out.writeBytes(p);
        }
        return out.toByteArray();
    }

    @Test
    void aSemicolonSeparatedWindows1252FileIsGuessedPrintedAndLoadedWithItsAccents() throws Exception {
        String rows = HEADER.replace(',', ';') + "1;50.5;north;2;true;fine;50\n2;51.5;south;3;false;caf\u00e9;49\n";
        int offset = rows.indexOf('\u00e9');
        CliRun r = importWave(write("households.csv", rows.getBytes(WINDOWS_1252)));
        assertEquals(0, r.exitCode(), r.err());
        assertTrue(r.out().contains("read households.csv as ';'-separated windows-1252 (guessed: bytes at offset "
                + String.format(Locale.ROOT, "%,d", offset) + " are not UTF-8; ';' gives 7 fields on the header and"
                + " each of the 2 rows sampled; pass --encoding/--delimiter to override)"), r.out());
        assertEquals("caf\u00e9", text("SELECT remark FROM src.answers WHERE respondent_id = 2"));
        assertEquals("2", text("SELECT count(*) FROM src.answers WHERE wave = 'w1'"));
    }

    @ParameterizedTest(name = "--delimiter {0}")
    @ValueSource(strings = {"tab", "\\t", "\t", "TAB"})
    void aTabSeparatedFileLoadsWithTheDelimiterGivenInAnyOfItsSpellings(String given) throws Exception {
        CliRun r = importWave(write("tabs.csv", HEADER.replace(',', '\t') + "1\t50.5\tnorth\t2\ttrue\ta, b\t50\n"),
                "--delimiter", given);
        assertEquals(0, r.exitCode(), r.err());
        assertTrue(r.out().contains("read tabs.csv as tab-separated UTF-8 (guessed: the whole file is valid UTF-8;"),
                r.out());
        assertEquals("a, b", text("SELECT remark FROM src.answers"));
    }

    @Test
    void aTabSeparatedFileIsGuessedWhenTheDelimiterIsNotGiven() throws Exception {
        CliRun r = importWave(write("tabs.tsv", HEADER.replace(',', '\t') + "1\t50.5\tnorth\t2\ttrue\ta, b\t50\n"
                + "2\t51.5\tsouth\t3\tfalse\tc\t49\n"));
        assertEquals(0, r.exitCode(), r.err());
        assertTrue(r.out().contains("as tab-separated UTF-8 (guessed: the whole file is valid UTF-8; tab gives 7"
                + " fields on the header and each of the 2 rows sampled;"), r.out());
        assertEquals("a, b", text("SELECT remark FROM src.answers WHERE respondent_id = 1"));
    }

    @Test
    void aUtf8ByteOrderMarkIsReadAndNotPartOfTheFirstColumnName() throws Exception {
        byte[] bom = {(byte) 0xEF, (byte) 0xBB, (byte) 0xBF};
        CliRun r = importWave(write("bom.csv", concat(bom, (HEADER + "1,50.5,Z\u00fcrich,2,true,x,50\n")
                .getBytes(StandardCharsets.UTF_8))));
        assertEquals(0, r.exitCode(), r.err());
        assertTrue(r.out().contains("as ','-separated UTF-8 (guessed: a UTF-8 byte order mark;"), r.out());
        assertEquals("Z\u00fcrich", text("SELECT region FROM src.answers WHERE respondent_id = 1"));
    }

    @Test
    void aUtf16FileWithAByteOrderMarkIsReadInEitherByteOrder() throws Exception {
        String rows = HEADER + "1,50.5,Z\u00fcrich,2,true,x,50\r\n2,51.5,\u0141\u00f3d\u017a,3,false,y,49\r\n";
        CliRun big = importWave(write("big-endian.csv", rows.getBytes(StandardCharsets.UTF_16)));
        assertEquals(0, big.exitCode(), big.err());
        assertTrue(big.out().contains("as ','-separated UTF-16 (guessed: a UTF-16 byte order mark;"), big.out());
        assertEquals("\u0141\u00f3d\u017a", text("SELECT region FROM src.answers WHERE respondent_id = 2"));
        byte[] le = concat(new byte[] {(byte) 0xFF, (byte) 0xFE}, rows.getBytes(StandardCharsets.UTF_16LE));
        CliRun little = CliRun.of("import", "--config", config.toString(), "--wave", "w2",
                write("little-endian.csv", le).toString());
        assertEquals(0, little.exitCode(), little.err());
        assertEquals("Z\u00fcrich", text("SELECT region FROM src.answers WHERE wave = 'w2' AND respondent_id = 1"));
    }

    @Test
    void anEncodingGivenOnTheCommandLineIsUsedAsGiven() throws Exception {
        String rows = HEADER + "1,50.5,north,2,true,\u00e6\u00f8\u00e5,50\n";
        CliRun r = importWave(write("nordic.csv", rows.getBytes(StandardCharsets.ISO_8859_1)),
                "--encoding", "ISO-8859-1", "--delimiter", ",");
        assertEquals(0, r.exitCode(), r.err());
        assertTrue(r.out().contains("read nordic.csv as ','-separated ISO-8859-1 (as given)"), r.out());
        assertEquals("\u00e6\u00f8\u00e5", text("SELECT remark FROM src.answers"));
    }

    @Test
    void aGzippedSemicolonFileStillLoads() throws Exception {
        ByteArrayOutputStream zipped = new ByteArrayOutputStream();
        try (OutputStream z = new GZIPOutputStream(zipped)) {
            z.write((HEADER.replace(',', ';') + "1;50.5;north;2;true;x;50\n").getBytes(StandardCharsets.UTF_8));
        }
        CliRun r = importWave(write("w1.csv.gz", zipped.toByteArray()));
        assertEquals(0, r.exitCode(), r.err());
        assertTrue(r.out().contains("as ';'-separated UTF-8"), r.out());
        assertEquals("1", text("SELECT count(*) FROM src.answers"));
    }

    @Test
    void headerNamesMatchTheTableWithoutRegardToCase() throws Exception {
        CliRun r = importWave(write("mixed.csv", "Respondent_ID,Score,REGION,Satisfied,Has_Car,Remark,Spread\n"
                + "7,50.5,north,2,true,x,50\n"));
        assertEquals(0, r.exitCode(), r.err());
        assertEquals("50.5", text("SELECT score FROM src.answers WHERE respondent_id = 7"));
    }

    @Test
    void aMisspeltHeaderNameIsRefusedWithTheClosestColumnAndTheList() throws Exception {
        CliRun r = importWave(write("misspelt.csv", "respondent_id,scroe,region,satisfied,has_car,remark,spread\n"
                + "7,50.5,north,2,true,x,50\n"));
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().contains("config error at misspelt.csv line 1, column 2: the header names 'scroe'"
                + " (column 2) (did you mean 'score'?) match no column of src.answers"), r.err());
        assertTrue(r.err().contains("its columns are wave, respondent_id, score, region, satisfied, has_car,"
                + " remark, spread"), r.err());
        assertEquals("0", text("SELECT count(*) FROM src.answers"));
    }

    @Test
    void twoHeaderNamesEqualWhenCaseIsIgnoredAreRefused() throws Exception {
        CliRun r = importWave(write("twice.csv", "respondent_id,score,Score\n1,2,3\n"));
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().contains("config error at twice.csv line 1, column 3: the header names 'score' (column 2)"
                + " and 'Score' are the same when case is ignored"), r.err());
    }

    @Test
    void aHeaderNameThatIsNotAPlainIdentifierIsRefusedWithANameToUse() throws Exception {
        CliRun r = importWave(write("spaces.csv", "respondent_id,\"household size\"\n1,2\n"));
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().contains("config error at spaces.csv line 1, column 2: the header name 'household size'"
                + " is not a plain name"), r.err());
        assertTrue(r.err().contains("for example to household_size"), r.err());
    }

    @Test
    void aBadValueAfterAQuotedFieldSpanningLinesIsRefusedAtTheLineAnEditorShows() throws Exception {
        CliRun r = importWave(write("multiline.csv", HEADER + "1,50.5,north,2,true,\"first line\nsecond line\",50\n"
                + "2,51.5,south,3,false,ok,49\n3,abc,east,1,true,ok,48\n"));
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().contains("multiline.csv line 5, column 2 (score): invalid input syntax for type double"
                + " precision"), r.err());
        assertEquals("0", text("SELECT count(*) FROM src.answers"));
    }

    @Test
    void aBadValueAfterSeveralRowsWithQuotedLineBreaksIsRefusedAtTheLineAnEditorShows() throws Exception {
        CliRun r = importWave(write("notes.csv", HEADER + "1,50.5,north,2,true,\"a\r\nb\",50\n"
                + "2,51.5,south,3,false,\"x\ny\nz\",49\n3,52.5,east,1,true,ok,48\n4,abc,west,1,true,ok,47\n"));
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().contains("notes.csv line 8, column 2 (score): invalid input syntax for type double"
                + " precision"), r.err());
    }

    @Test
    void aRaggedRowAfterQuotedLineBreaksInAWindowsFileIsRefusedAtItsLine() throws Exception {
        CliRun r = importWave(write("crlf.csv", (HEADER + "1,50.5,north,2,true,\"a\r\nb\r\nc\",50\r\n"
                + "2,51.5,south\r\n").replace("\n", "\r\n").replace("\r\r\n", "\r\n")));
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().contains("crlf.csv line 5, column 4 (satisfied): the row ends after 3 fields but the"
                + " header has 7"), r.err());
    }

    @Test
    void aQuotedFieldSpanningLinesIsLoadedWithItsLineBreaks() throws Exception {
        CliRun r = importWave(write("note.csv", HEADER + "1,50.5,north,2,true,\"said \"\"no\"\"\nthen left\",50\n"
                + "2,51.5,south,3,false,,49\n3,52.5,east,1,true,\"\",48\n"));
        assertEquals(0, r.exitCode(), r.err());
        assertEquals("said \"no\"\nthen left", text("SELECT remark FROM src.answers WHERE respondent_id = 1"));
        assertEquals("1", text("SELECT count(*) FROM src.answers WHERE remark IS NULL AND respondent_id = 2"));
        assertEquals("1", text("SELECT count(*) FROM src.answers WHERE remark = '' AND respondent_id = 3"));
    }

    @Test
    void aNulByteIsRefusedNamingLineAndColumn() throws Exception {
        CliRun r = importWave(write("nul.csv", HEADER + "1,50.5,north,2,true,fine,50\n"
                + "2,51.5,south,3,false,a\u0000b,49\n"));
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().contains("nul.csv line 3, column 6 (remark): a NUL byte (0x00) is in the value"), r.err());
    }

    @Test
    void bytesInvalidInTheDeclaredWindows1252AreRefusedNamingLineAndColumn() throws Exception {
        // 0x81 is one of the five bytes windows-1252 leaves undefined.
        byte[] file = concat((HEADER + "1,50.5,north,2,true,").getBytes(StandardCharsets.US_ASCII),
                new byte[] {(byte) 0x81}, ",50\n".getBytes(StandardCharsets.US_ASCII));
        CliRun r = importWave(write("cp1252.csv", file), "--encoding", "windows-1252");
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().contains("cp1252.csv line 2, column 6 (remark): bytes 0x81 at byte offset"), r.err());
        assertTrue(r.err().contains("are not valid windows-1252 (the encoding given)"), r.err());
    }

    @Test
    void bytesNotUtf8PastTheSampledPrefixAreRefusedSayingTheEncodingWasGuessed() throws Exception {
        StringBuilder rows = new StringBuilder(HEADER);
        int n = 0;
        while (rows.length() < CsvSniffer.PREFIX_BYTES + 1000) {
            rows.append(++n).append(",50.5,north,2,true,a fairly long remark to fill the sample,50\n");
        }
        byte[] file = concat(rows.toString().getBytes(StandardCharsets.UTF_8),
                ("0,51.5,south,3,false,caf\u00e9,49\n").getBytes(StandardCharsets.ISO_8859_1));
        CliRun r = importWave(write("late.csv", file));
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.out().contains("(guessed: the first 4 MB are valid UTF-8;"), r.out());
        assertTrue(r.err().contains("late.csv line " + (n + 2) + ", column 6 (remark): bytes 0xE9 at byte offset"),
                r.err());
        assertTrue(r.err().contains("are not valid UTF-8 (the encoding guessed: the first 4 MB are valid UTF-8);"
                + " pass the file's encoding, for example --encoding windows-1252"), r.err());
        assertEquals("0", text("SELECT count(*) FROM src.answers"));
    }

    @Test
    void aQuoteLeftOpenIsRefusedNamingTheLineItOpensOn() throws Exception {
        CliRun r = importWave(write("open.csv", HEADER + "1,50.5,north,2,true,\"never closed,50\n2,51.5\n"));
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().contains("open.csv line 2, column 6 (remark): a quoted field opened on line 2 is not"
                + " closed before the end of the file"), r.err());
    }

    @Test
    void anEmptyLineBetweenRowsIsRefusedButEmptyLinesAtTheEndAreNot() throws Exception {
        CliRun gap = importWave(write("gap.csv", HEADER + "1,50.5,north,2,true,x,50\n\n2,51.5,south,3,false,y,49\n"));
        assertEquals(2, gap.exitCode(), gap.err());
        assertTrue(gap.err().contains("gap.csv line 3: the line is empty but rows follow it"), gap.err());
        CliRun tail = importWave(write("tail.csv", HEADER + "1,50.5,north,2,true,x,50\n\n\n"));
        assertEquals(0, tail.exitCode(), tail.err());
        assertEquals("1", text("SELECT count(*) FROM src.answers"));
    }

    @Test
    void anUnknownDelimiterOrEncodingIsABadCommandLine() throws Exception {
        Path csv = write("w1.csv", HEADER + "1,50.5,north,2,true,x,50\n");
        CliRun d = importWave(csv, "--delimiter", ":");
        assertEquals(2, d.exitCode(), d.err());
        assertTrue(d.err().contains("config error at --delimiter: expected one of ',' ';' '|' or tab"), d.err());
        CliRun e = importWave(csv, "--encoding", "klingon-8");
        assertEquals(2, e.exitCode(), e.err());
        assertTrue(e.err().contains("config error at --encoding: unknown encoding 'klingon-8'"), e.err());
        assertFalse(e.out().contains("imported"), e.out());
    }
}
