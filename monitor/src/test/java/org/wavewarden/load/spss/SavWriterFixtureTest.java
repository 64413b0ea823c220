package org.wavewarden.load.spss;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.IOException;
import java.io.InputStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The check against R that runs without R: {@code sav-writer/household-5.sav} was written by this writer and read
 * by R 4.2.2 with haven 2.5.1 ({@code read-back.R}), whose reading is committed as {@code household-5.haven.json}.
 * The writer must still write those bytes, and that reading must hold every value, label and missing declaration
 * of the sample. {@link SavWriterIndependentReadersTest} checks, where R is installed, that R still reads the
 * fixture so.
 */
class SavWriterFixtureTest {

    @TempDir
    Path dir;

    private static byte[] resource(String name) throws IOException {
        try (InputStream in = SavWriterFixtureTest.class.getResourceAsStream("/sav-writer/" + name)) {
            assertNotNull(in, name + " is committed");
            return in.readAllBytes();
        }
    }

    /**
     * The fields that name the writer's version (the product name in the header, the version in the machine integer
     * info record) blanked, so that a new release of Wavewarden does not make the fixture stale.
     */
    static byte[] withoutVersion(byte[] file) {
        byte[] out = file.clone();
        Arrays.fill(out, 4, 64, (byte) 0);
        byte[] header = ByteBuffer.allocate(16).order(ByteOrder.LITTLE_ENDIAN).putInt(7).putInt(3).putInt(4)
                .putInt(8).array();
        for (int i = 0; i + header.length + 12 <= out.length; i++) {
            if (Arrays.equals(out, i, i + header.length, header, 0, header.length)) {
                Arrays.fill(out, i + header.length, i + header.length + 12, (byte) 0);
                return out;
            }
        }
        throw new AssertionError("no machine integer info record");
    }

    @Test
    void theWriterStillWritesTheBytesRReadInTheCommittedFixture() throws IOException {
        Path written = SavWriterSamples.household(5).write(dir, SavWriter.Compression.BYTECODE);
        assertArrayEquals(withoutVersion(resource("household-5.sav")), withoutVersion(Files.readAllBytes(written)),
                "rewrite the fixture and R's reading of it (SavWriterSamples.main, read-back.R) if the format"
                        + " changed on purpose");
    }

    @Test
    void rsCommittedReadingOfTheFixtureHoldsEveryValueLabelAndMissingDeclaration() throws IOException {
        JsonNode dump = new ObjectMapper().readTree(resource("household-5.haven.json")).path("household-5.sav");
        assertTrue(dump.path("reader").asText().startsWith("R 4.2.2 haven 2.5.1"), dump.path("reader").asText());
        SavWriterReadBack.assertHavenReads(SavWriterSamples.household(5), dump, "household-5.sav as read by "
                + dump.path("reader").asText());
    }
}
