package org.wavewarden.load.spss;

import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

/**
 * The committed scripts run again with the tools on this machine (written against R 4.2.2 with haven 2.5.1 and GNU
 * PSPP 1.6.2, Debian's r-cran-haven and pspp, which .ci/run installs): files written now, read by the reader, held
 * against what R and PSPP read back from them. Skipped where the tools are missing, except on CI (CI=true), where
 * their absence is a failure.
 */
class SavReaderLiveToolsTest {

    private static final List<String> FILES = List.of("haven-none.sav", "haven-byte.sav", "haven.zsav",
            "pspp-none.sav", "pspp-byte.sav", "pspp.zsav", "pspp-latin1.sav");

    @BeforeAll
    static void requireTools() {
        List<String> missing = new ArrayList<>();
        if (!succeeds("Rscript", "-e", "library(haven)")) {
            missing.add("Rscript with haven (Debian r-base-core, r-cran-haven)");
        }
        if (!succeeds("pspp", "--version")) {
            missing.add("pspp (Debian pspp)");
        }
        if (missing.isEmpty()) {
            return;
        }
        String message = "not on the PATH: " + String.join(", ", missing);
        if ("true".equals(System.getenv("CI"))) {
            fail(message + "; .ci/run installs them");
        }
        Assumptions.assumeTrue(false, message);
    }

    private static boolean succeeds(String... command) {
        try {
            Process p = new ProcessBuilder(command).redirectErrorStream(true)
                    .redirectOutput(ProcessBuilder.Redirect.DISCARD).start();
            return p.waitFor(120, TimeUnit.SECONDS) && p.exitValue() == 0;
        } catch (IOException e) {
            return false;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return false;
        }
    }

    private static void run(Path dir, String... command) throws IOException, InterruptedException {
        Path log = dir.resolve("run.log");
        Process p = new ProcessBuilder(command).directory(dir.toFile()).redirectErrorStream(true)
                .redirectOutput(log.toFile()).start();
        boolean done = p.waitFor(300, TimeUnit.SECONDS);
        if (!done) {
            p.destroyForcibly();
        }
        assertTrue(done && p.exitValue() == 0,
                () -> String.join(" ", command) + " failed:\n" + read(log));
    }

    private static String read(Path log) {
        try {
            return Files.readString(log, StandardCharsets.UTF_8);
        } catch (IOException e) {
            return e.toString();
        }
    }

    @Test
    void filesWrittenNowByHavenAndPsppReadAsRAndPsppReadThem(@TempDir Path dir) throws Exception {
        Path scripts = SavReaderRoundTripTest.fixture("make-fixtures.sh").getParent();
        run(dir, "sh", scripts.resolve("make-fixtures.sh").toString(), dir.toString());

        for (String file : FILES) {
            ToolReadback.Comparison c = ToolReadback.compareWithHaven(dir.resolve(file),
                    dir.resolve(file + ".haven.tsv"), dir.resolve(file + ".pspp.csv"));
            assertEquals(List.of(), c.differences(), file);
            assertTrue(c.values() >= c.variables() * 3L && c.measures() == c.variables(), () -> file + ": " + c);
        }
    }

    @Test
    void aMillionCaseZsavWrittenByPsppIsReadOneCaseAtATime(@TempDir Path dir) throws Exception {
        // GNU PSPP 1.6.2 writes x = 1..1,000,000 and group = x mod 7; the sums are exact in doubles.
        Path syntax = dir.resolve("million.sps");
        Path out = dir.resolve("million.zsav");
        Files.writeString(syntax, String.join("\n",
                "INPUT PROGRAM.",
                "LOOP #i = 1 TO 1000000.",
                "COMPUTE x = #i.",
                "COMPUTE group = MOD(#i, 7).",
                "END CASE.",
                "END LOOP.",
                "END FILE.",
                "END INPUT PROGRAM.",
                "SAVE OUTFILE='" + out + "' /ZCOMPRESSED.", ""));
        run(dir, "pspp", syntax.toString());

        long cases = 0;
        double sumX = 0;
        double sumGroup = 0;
        try (SavReader reader = SavFiles.open(out)) {
            Object[] row = new Object[2];
            while (reader.next(row)) {
                cases++;
                sumX += (Double) row[0];
                sumGroup += (Double) row[1];
            }
        }
        assertEquals(1_000_000L, cases);
        assertEquals(500_000_500_000.0, sumX);
        // 142,857 full rounds of 0+1+...+6 = 21, then 1 left over (1,000,000 = 7 * 142,857 + 1).
        assertEquals(142_857 * 21 + 1, sumGroup);
    }
}
