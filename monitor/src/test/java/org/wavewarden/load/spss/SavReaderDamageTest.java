package org.wavewarden.load.spss;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

/**
 * A damaged delivery is reported, never a crash: whatever is cut off or overwritten, the reader either reads the
 * file as it was or fails with a {@link SavFormatException} that names the file, the record and the byte offset.
 */
class SavReaderDamageTest {

    @TempDir
    Path dir;

    /** Every case of a file, or the exception the reader gave. */
    private record Outcome(List<List<Object>> cases, SavFormatException error) {
    }

    private static Outcome readAll(Path file) {
        List<List<Object>> cases = new ArrayList<>();
        try (SavReader reader = SavFiles.open(file)) {
            Object[] row = new Object[reader.codebook().variables().size()];
            while (reader.next(row)) {
                cases.add(Arrays.asList(row.clone()));
            }
            return new Outcome(cases, null);
        } catch (SavFormatException e) {
            return new Outcome(cases, e);
        } catch (Exception e) {
            throw new AssertionError(file.getFileName() + " failed with " + e + " instead of a SavFormatException", e);
        }
    }

    @ParameterizedTest(name = "{0}")
    @ValueSource(strings = {"pspp-none.sav", "haven-byte.sav", "pspp.zsav", "haven.zsav"})
    void aFileCutAtAnyByteFailsNamingFileRecordAndOffsetOrReadsInFull(String fixture) throws IOException {
        byte[] whole = Files.readAllBytes(SavReaderRoundTripTest.fixture(fixture));
        Outcome full = readAll(SavReaderRoundTripTest.fixture(fixture));
        assertEquals(8, full.cases().size());
        Path cut = dir.resolve("cut-" + fixture);
        int failed = 0;
        int tried = 0;
        // Every cut in the first 800 bytes (header, variable records), every 13th after (all would take minutes).
        for (int length = 0; length < whole.length; length += length < 800 ? 1 : 13) {
            tried++;
            Files.write(cut, Arrays.copyOf(whole, length));
            Outcome o = readAll(cut);
            if (o.error() == null) {
                // Only the padding after the last case of bytecode-compressed data may be lost unnoticed.
                assertEquals(full.cases(), o.cases(), "cut at " + length + " read other cases");
            } else {
                failed++;
                String message = o.error().getMessage();
                String where = "cut at " + length + ": " + message;
                assertTrue(message.startsWith(cut + ": ") && message.contains("byte offset "), where);
                assertTrue(o.error().offset() <= length || message.contains("inflated"), where);
            }
        }
        assertTrue(failed >= tried - 3, "only " + failed + " of " + tried + " cuts were reported");
    }

    @ParameterizedTest(name = "{0}")
    @ValueSource(strings = {"pspp-byte.sav", "haven-none.sav", "pspp.zsav"})
    void overwrittenBytesNeverCrashTheReader(String fixture) throws IOException {
        byte[] whole = Files.readAllBytes(SavReaderRoundTripTest.fixture(fixture));
        Random random = new Random(14);
        Path damaged = dir.resolve("damaged-" + fixture);
        int reported = 0;
        for (int trial = 0; trial < 400; trial++) {
            byte[] copy = whole.clone();
            int at = random.nextInt(copy.length);
            copy[at] = (byte) (trial % 3 == 0 ? 0xff : trial % 3 == 1 ? 0x7f : random.nextInt(256));
            Files.write(damaged, copy);
            if (readAll(damaged).error() != null) {
                reported++;
            }
        }
        assertTrue(reported > 0, "no overwritten byte was noticed");
    }

    @Test
    void aFileThatIsNoSystemFileIsRefusedAtOffsetZero() throws IOException {
        Path csv = dir.resolve("wave.sav");
        Files.writeString(csv, "id,region\n1,2\n");

        SavFormatException e = assertThrows(SavFormatException.class, () -> SavFiles.open(csv));

        assertEquals(4, e.offset());
        assertTrue(e.getMessage().contains("not an SPSS system file"), e.getMessage());
    }

    @Test
    void anUnknownExtensionRecordIsSkippedAndTheCharacterCodeGivesTheEncoding() throws IOException {
        // pspp-latin1.sav: GNU PSPP 1.6.2 wrote a windows-1252 dictionary with the character encoding record
        // (subtype 20) and character code 1252 in the integer info record. Renumbering subtype 20 to 99 leaves an
        // unknown record to skip and only the character code to go by.
        byte[] bytes = Files.readAllBytes(SavReaderRoundTripTest.fixture("pspp-latin1.sav"));
        byte[] header = {7, 0, 0, 0, 20, 0, 0, 0, 1, 0, 0, 0};
        int at = indexOf(bytes, header);
        assertTrue(at > 0, "no character encoding record in the fixture");
        bytes[at + 4] = 99;
        Path file = dir.resolve("no-encoding-record.sav");
        Files.write(file, bytes);

        try (SavReader reader = SavFiles.open(file)) {
            assertEquals("Région (codée)", reader.codebook().variable("x").orElseThrow().label());
            Object[] row = new Object[2];
            assertTrue(reader.next(row));
            assertEquals("Zürich", row[1]);
        }
    }

    private static int indexOf(byte[] hay, byte[] needle) {
        outer:
        for (int i = 0; i + needle.length <= hay.length; i++) {
            for (int k = 0; k < needle.length; k++) {
                if (hay[i + k] != needle[k]) {
                    continue outer;
                }
            }
            return i;
        }
        return -1;
    }

    @Test
    void aCaseCutShortInTheMiddleNamesTheCase() throws IOException {
        byte[] whole = Files.readAllBytes(SavReaderRoundTripTest.fixture("pspp-none.sav"));
        Path cut = dir.resolve("short.sav");
        Files.write(cut, Arrays.copyOf(whole, whole.length - 20));

        Outcome o = readAll(cut);

        if (o.error() == null) {
            fail("a file missing the end of its last case was read without complaint");
        }
        assertEquals(7, o.cases().size());
        assertTrue(o.error().getMessage().contains("case 8"), o.error().getMessage());
    }
}
