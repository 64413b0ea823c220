package org.wavewarden.load.spss;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import org.wavewarden.codebook.DatasetCodebook;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;

/**
 * Files of every kind the writer makes (no compression, bytecode, zlib; 0, 1 and 37 cases of a survey with every
 * kind of variable) read live by independent tools: R 4.2.2 with haven 2.5.1 ({@code read_sav(user_na = TRUE)},
 * Debian's r-cran-haven, through {@code sav-writer/read-back.R}) must read back every value, variable label, value
 * label and missing declaration; GNU PSPP 1.6.2 (Debian's pspp) must read each file without a warning and show its
 * measurement levels and missing values. Skipped when the tools are not on the PATH, except on CI.
 */
class SavWriterIndependentReadersTest {

    private static final ObjectMapper JSON = new ObjectMapper();

    @TempDir
    static Path dir;
    private static final Map<String, SavWriterSamples.Sample> WRITTEN = new LinkedHashMap<>();
    private static JsonNode haven;

    static List<String> files() {
        List<String> out = new ArrayList<>();
        for (int cases : new int[]{0, 1, 37}) {
            for (SavWriter.Compression c : SavWriter.Compression.values()) {
                out.add("household-" + cases + "-" + c.name().toLowerCase(Locale.ROOT)
                        + (c == SavWriter.Compression.ZLIB ? ".zsav" : ".sav"));
            }
        }
        return out;
    }

    @BeforeAll
    static void writeEveryKindOfFile() throws IOException {
        for (int cases : new int[]{0, 1, 37}) {
            SavWriterSamples.Sample s = SavWriterSamples.household(cases);
            for (SavWriter.Compression c : SavWriter.Compression.values()) {
                WRITTEN.put(s.write(dir, c).getFileName().toString(), s);
            }
        }
        assertEquals(files(), List.copyOf(WRITTEN.keySet()));
    }

    /** haven's reading of every written file, read once (one R start for all files). */
    private static synchronized JsonNode haven() throws Exception {
        if (haven == null) {
            List<Path> paths = WRITTEN.keySet().stream().map(dir::resolve).toList();
            haven = JSON.readTree(SavWriterReadBack.haven(dir, paths).toFile());
        }
        return haven;
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("files")
    void havenReadsBackEveryValueLabelAndMissingDeclaration(String file) throws Exception {
        JsonNode read = haven().path(file);
        assertFalse(read.isMissingNode(), "haven read " + file);
        SavWriterReadBack.assertHavenReads(WRITTEN.get(file), read,
                file + " read by " + read.path("reader").asText());
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("files")
    void psppReadsTheFileWithoutAWarningAndShowsMeasuresAndMissingValues(String file) throws Exception {
        SavWriterReadBack.Pspp p = SavWriterReadBack.pspp(dir, dir.resolve(file));
        assertEquals(0, p.exit(), p.console());
        String said = p.console().toLowerCase(Locale.ROOT);
        assertFalse(said.contains("warning") || said.contains("error"), "PSPP 1.6.2 complained:\n" + p.console());
        SavWriterSamples.Sample sample = WRITTEN.get(file);
        for (SavWriterSamples.Column c : sample.columns()) {
            Map<String, String> row = p.variable(c.meta().name());
            assertEquals(c.psppMeasure(), row.get("Measurement Level"), c.meta().name() + ": measurement level");
            assertEquals(c.psppMissing(), row.get("Missing Values"), c.meta().name() + ": missing values");
        }
        List<List<String>> listed = p.tables().getOrDefault("Data List", List.of());
        assertEquals(sample.cases(), Math.max(0, listed.size() - 1), "cases PSPP lists:\n" + p.console());
        if (sample.cases() > 0) {
            int column = listed.get(0).indexOf("open_answer");
            assertEquals(SavWriterSamples.LONG_TEXT, listed.get(1).get(column),
                    "the very long non-ASCII string comes back whole");
        }
    }

    static List<Long> seeds() {
        return SavRoundTripPropertyTest.seeds().toList();
    }

    /** The random codebooks of {@link SavRoundTripPropertyTest}: both readers take every one without complaint. */
    @ParameterizedTest(name = "seed {0}")
    @MethodSource("seeds")
    void bothReadersTakeRandomCodebooksAndCasesWithoutComplaint(long seed) throws Exception {
        SavRoundTripPropertyTest.Drawn drawn = SavRoundTripPropertyTest.draw(seed);
        Path file = drawn.write(dir, "random-" + seed);
        SavWriterReadBack.Pspp p = SavWriterReadBack.pspp(dir, file);
        assertEquals(0, p.exit(), p.console());
        String said = p.console().toLowerCase(Locale.ROOT);
        assertFalse(said.contains("warning") || said.contains("error"), "PSPP 1.6.2 complained:\n" + p.console());
        String rscript = SavWriterReadBack.tool("Rscript", "r-cran-haven");
        SavWriterReadBack.Run r = SavWriterReadBack.run(dir, List.of(rscript, "-e",
                "d <- haven::read_sav('" + file.getFileName() + "', user_na = TRUE); cat(nrow(d), ncol(d))"));
        assertEquals(0, r.exit(), r.output());
        assertEquals(drawn.cases().size() + " " + drawn.codebook().variables().size(), r.output().strip(),
                "R 4.2.2 haven 2.5.1: cases and variables");
    }

    /** 40,000 cases of text bytecode cannot shorten: the zlib data spans three blocks of 4 MB. */
    @Test
    void bothReadersReadAZsavOfSeveralZlibBlocksToTheLastCase() throws Exception {
        DatasetCodebook cb = new DatasetCodebook("blocks", null, List.of(SavWriterTest.number("n"),
                SavWriterTest.text("t", 255)));
        List<Object[]> cases = new ArrayList<>();
        for (int i = 1; i <= 40_000; i++) {
            cases.add(new Object[]{(double) i, ("case " + i + " ").repeat(40).substring(0, 255).strip()});
        }
        Path file = dir.resolve("blocks.zsav");
        SavWriter.write(file, cb, cases, SavWriter.Compression.ZLIB, SavWriterSamples.CREATED);
        Object[] last = cases.get(cases.size() - 1);

        String rscript = SavWriterReadBack.tool("Rscript", "r-cran-haven");
        SavWriterReadBack.Run r = SavWriterReadBack.run(dir, List.of(rscript, "-e",
                "d <- haven::read_sav('blocks.zsav'); cat(nrow(d), sum(d$n), d$t[nrow(d)], sep = '\\n')"));
        assertEquals(0, r.exit(), r.output());
        assertEquals(List.of("40000", "800020000", (String) last[1]), r.output().lines().toList(),
                "R 4.2.2 haven 2.5.1: cases, the sum of 1..40000, the last case's text");

        SavWriterReadBack.Pspp p = SavWriterReadBack.pspp(dir, file, "LIST /CASES=FROM 40000 TO 40000.");
        assertEquals(0, p.exit(), p.console());
        assertFalse(p.console().toLowerCase(Locale.ROOT).contains("warning"), p.console());
        assertEquals(List.of(List.of("n", "t"), List.of("40000", (String) last[1])), p.tables().get("Data List"),
                "PSPP 1.6.2 lists the last case");
    }

    /**
     * The committed fixture's reading by haven is committed beside it, so {@link SavWriterFixtureTest} checks the
     * writer without R; here R reads the fixture again and must say exactly what the committed reading says.
     */
    @Test
    void havenReadsTheCommittedFixtureAsItsCommittedReadingSays() throws Exception {
        Path fixture = dir.resolve("household-5.sav");
        try (InputStream in = getClass().getResourceAsStream("/sav-writer/household-5.sav");
             InputStream dump = getClass().getResourceAsStream("/sav-writer/household-5.haven.json")) {
            assertNotNull(in, "the fixture is committed");
            assertNotNull(dump, "haven's reading of the fixture is committed");
            Files.copy(in, fixture, java.nio.file.StandardCopyOption.REPLACE_EXISTING);
            JsonNode now = JSON.readTree(SavWriterReadBack.haven(dir, List.of(fixture)).toFile());
            assertEquals(JSON.readTree(dump), now);
            assertEquals(5, now.path("household-5.sav").path("rows").asInt());
        }
    }
}
