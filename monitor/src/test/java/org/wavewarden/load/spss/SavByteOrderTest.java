package org.wavewarden.load.spss;

import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.codebook.VariableMeta;
import org.wavewarden.config.MissingCodeSpec;

import java.io.ByteArrayOutputStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Files from machines of either byte order, built record by record as the format description lays them out (haven
 * and PSPP on this machine write only little-endian files): the layout code tells the order, and a file that does
 * not announce its case count ends at the last whole case.
 */
class SavByteOrderTest {

    @TempDir
    Path dir;

    /** An uncompressed file with x (F8.2, label, value label, user-missing -9) and s (A8), three cases. */
    private static byte[] file(ByteOrder order, int caseCount) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        ByteBuffer b = ByteBuffer.allocate(4096).order(order);
        b.put("$FL2".getBytes(StandardCharsets.US_ASCII));
        b.put(pad("@(#) SPSS DATA FILE byte order test", 60));
        b.putInt(2).putInt(2).putInt(0).putInt(0).putInt(caseCount).putDouble(100.0);
        b.put(pad("02 Dec 26", 9)).put(pad("12:00:00", 8)).put(pad("Byte order", 64)).put(new byte[3]);
        b.putInt(2).putInt(0).putInt(1).putInt(1).putInt(5 << 16 | 8 << 8 | 2).putInt(5 << 16 | 8 << 8 | 2);
        b.put(pad("X", 8));
        byte[] label = "Household size".getBytes(StandardCharsets.UTF_8);
        b.putInt(label.length).put(label).put(new byte[(4 - label.length % 4) % 4]);
        b.putDouble(-9);
        b.putInt(2).putInt(8).putInt(0).putInt(0).putInt(1 << 16 | 8 << 8).putInt(1 << 16 | 8 << 8);
        b.put(pad("S", 8));
        byte[] refused = "Refused".getBytes(StandardCharsets.UTF_8);
        b.putInt(3).putInt(1).putDouble(-9).put((byte) refused.length).put(refused);
        b.put(new byte[(8 - (refused.length + 1) % 8) % 8]);
        b.putInt(4).putInt(1).putInt(1);
        b.putInt(7).putInt(3).putInt(4).putInt(8).putInt(1).putInt(0).putInt(0)
                .putInt(order == ByteOrder.BIG_ENDIAN ? 1 : 2).putInt(1).putInt(0)
                .putInt(order == ByteOrder.BIG_ENDIAN ? 1 : 2).putInt(65001);
        b.putInt(7).putInt(11).putInt(4).putInt(6).putInt(3).putInt(8).putInt(1).putInt(1).putInt(8).putInt(0);
        b.putInt(7).putInt(13).putInt(1).putInt(12).put("X=hhsize\tS=s".getBytes(StandardCharsets.US_ASCII));
        b.putInt(7).putInt(777).putInt(2).putInt(3).put(new byte[6]);
        b.putInt(999).putInt(0);
        double[] x = {3, -9, -Double.MAX_VALUE};
        String[] s = {"abc", "Zürich", ""};
        for (int i = 0; i < 3; i++) {
            b.putDouble(x[i]).put(pad(s[i], 8));
        }
        out.write(b.array(), 0, b.position());
        return out.toByteArray();
    }

    private static byte[] pad(String text, int width) {
        byte[] bytes = text.getBytes(StandardCharsets.UTF_8);
        byte[] padded = new byte[width];
        Arrays.fill(padded, (byte) ' ');
        System.arraycopy(bytes, 0, padded, 0, Math.min(bytes.length, width));
        return padded;
    }

    @ParameterizedTest(name = "{0}, case count {1}")
    @CsvSource({"BIG_ENDIAN, 3", "LITTLE_ENDIAN, 3", "BIG_ENDIAN, -1", "LITTLE_ENDIAN, -1"})
    void eitherByteOrderReadsTheSameDictionaryAndCases(String orderName, int caseCount) throws Exception {
        ByteOrder order = orderName.equals("BIG_ENDIAN") ? ByteOrder.BIG_ENDIAN : ByteOrder.LITTLE_ENDIAN;
        Path file = dir.resolve(orderName + ".sav");
        Files.write(file, file(order, caseCount));

        try (SavReader reader = SavFiles.open(file)) {
            VariableMeta x = reader.codebook().variables().get(0);
            assertEquals("hhsize", x.name());
            assertEquals("Household size", x.label());
            assertEquals("F8.2", x.format());
            assertEquals(Map.of("-9", "Refused"), x.valueLabels());
            assertEquals(List.of(new MissingCodeSpec("-9", "Refused")), x.missingCodes());
            assertEquals("s", reader.codebook().variables().get(1).name());
            assertEquals("Byte order", reader.codebook().title());
            List<List<Object>> cases = new ArrayList<>();
            Object[] row = new Object[2];
            while (reader.next(row)) {
                cases.add(Arrays.asList(row.clone()));
            }
            assertEquals(List.of(Arrays.asList(3.0, "abc"), Arrays.asList(-9.0, "Zürich"), Arrays.asList(null, "")),
                    cases);
            assertFalse(reader.next(row));
        }
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource({"BIG_ENDIAN", "LITTLE_ENDIAN"})
    void aFileWithoutACaseCountCutInsideACaseNamesTheCase(String orderName) throws Exception {
        ByteOrder order = orderName.equals("BIG_ENDIAN") ? ByteOrder.BIG_ENDIAN : ByteOrder.LITTLE_ENDIAN;
        byte[] whole = file(order, -1);
        Path file = dir.resolve("cut.sav");
        Files.write(file, Arrays.copyOf(whole, whole.length - 8));

        try (SavReader reader = SavFiles.open(file)) {
            Object[] row = new Object[2];
            assertTrue(reader.next(row));
            assertTrue(reader.next(row));
            SavFormatException e = assertThrows(SavFormatException.class, () -> reader.next(row));
            assertTrue(e.getMessage().contains("case 3"), e.getMessage());
        }
    }
}
