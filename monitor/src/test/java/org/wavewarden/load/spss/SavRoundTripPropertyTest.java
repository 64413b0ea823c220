package org.wavewarden.load.spss;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.codebook.Codes;
import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.Measure;
import org.wavewarden.codebook.StorageType;
import org.wavewarden.codebook.VariableMeta;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.load.CaseSource;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.time.LocalDate;
import java.time.LocalDateTime;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import java.util.Set;
import java.util.stream.IntStream;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Write then read: for random codebooks and cases (seeded, so a failure repeats), what {@link SavFiles#open} reads
 * from a file {@link SavWriter} wrote is what was written: the title, each variable's name, label, storage, width,
 * measure, value labels, missing values and ranges, and every value (text without its trailing blanks, system
 * missing as null). Reasons of missing values and units are not part of the format and are not compared.
 */
class SavRoundTripPropertyTest {

    @TempDir
    Path dir;

    static Stream<Long> seeds() {
        return IntStream.rangeClosed(1, 30).mapToObj(i -> (long) i);
    }

    private static final String LETTERS = "abcdefghijklmnopqrstuvwxyzäöüéß";
    private static final String TEXT = "abc xyz ÄÖÜ äöü é € – 0123456789";

    private static String word(Random r, int min, int max, String alphabet) {
        int n = min + r.nextInt(max - min + 1);
        StringBuilder b = new StringBuilder();
        for (int i = 0; i < n; i++) {
            b.append(alphabet.charAt(r.nextInt(alphabet.length())));
        }
        return b.toString();
    }

    /** Text of at most {@code bytes} bytes in UTF-8 with no trailing blank. */
    private static String text(Random r, int bytes) {
        String s = word(r, 0, Math.max(0, bytes), TEXT).stripTrailing();
        while (s.getBytes(StandardCharsets.UTF_8).length > bytes) {
            s = s.substring(0, s.length() - 1).stripTrailing();
        }
        return s;
    }

    private static String name(Random r, Set<String> taken) {
        while (true) {
            String n = word(r, 1, 1, LETTERS) + word(r, 0, r.nextBoolean() ? 6 : 40, LETTERS + "0123456789_");
            if (n.getBytes(StandardCharsets.UTF_8).length <= 64 && taken.add(n.toUpperCase(Locale.ROOT))
                    && !Set.of("ALL", "AND", "BY", "EQ", "GE", "GT", "LE", "LT", "NE", "NOT", "OR", "TO", "WITH")
                    .contains(n.toUpperCase(Locale.ROOT))) {
                return n;
            }
        }
    }

    private static VariableMeta variable(Random r, Set<String> taken) {
        String name = name(r, taken);
        String label = r.nextBoolean() ? null : text(r, 200);
        label = label == null || label.isEmpty() ? null : label;
        Measure measure = List.of(Measure.NOMINAL, Measure.ORDINAL, Measure.SCALE).get(r.nextInt(3));
        StorageType storage = StorageType.values()[r.nextInt(StorageType.values().length)];
        Map<String, String> labels = new LinkedHashMap<>();
        List<MissingCodeSpec> missing = new ArrayList<>();
        List<MissingRangeSpec> ranges = new ArrayList<>();
        Integer width = null;
        if (storage == StorageType.TEXT) {
            width = List.of(1, 3, 8, 9, 40, 255, 256, 300, 700).get(r.nextInt(9));
            for (int i = r.nextInt(4); i > 0; i--) {
                labels.put(text(r, width), text(r, 60));
            }
            for (int i = r.nextInt(4); i > 0; i--) {
                String v = text(r, Math.min(8, width));
                if (missing.stream().noneMatch(m -> m.value().equals(v))) {
                    missing.add(new MissingCodeSpec(v, "no answer"));
                }
            }
        } else if (storage == StorageType.NUMBER) {
            for (int i = r.nextInt(5); i > 0; i--) {
                labels.put(Codes.of(r.nextInt(30) - 9), text(r, 120));
            }
            int kind = r.nextInt(4);
            if (kind == 1) {
                for (int i = 1 + r.nextInt(3); i > 0; i--) {
                    String v = Codes.of(-1 - r.nextInt(9));
                    if (missing.stream().noneMatch(m -> m.value().equals(v))) {
                        missing.add(new MissingCodeSpec(v, "no answer"));
                    }
                }
            } else if (kind >= 2) {
                Double low = r.nextInt(4) == 0 ? null : -99.0 + r.nextInt(5);
                Double high = r.nextInt(4) == 0 ? null : -91.0 + r.nextInt(5);
                ranges.add(new MissingRangeSpec(low, high, "no answer"));
                if (kind == 3) {
                    missing.add(new MissingCodeSpec(Codes.of(97 + r.nextInt(3)), "no answer"));
                }
            }
        }
        return new VariableMeta(name, label, storage, width, storage == StorageType.NUMBER ? r.nextInt(4) : null,
                null, measure, null, labels, missing, ranges, null);
    }

    private static Object value(Random r, VariableMeta v) {
        if (r.nextInt(8) == 0) {
            return null;
        }
        return switch (v.storage()) {
            case TEXT -> text(r, v.width());
            case NUMBER -> switch (r.nextInt(4)) {
                case 0 -> (double) (r.nextInt(400) - 150);
                case 1 -> r.nextGaussian() * 1e6;
                case 2 -> v.missingCodes().isEmpty() ? 0.0 : Double.parseDouble(v.missingCodes().get(0).value());
                default -> (double) r.nextInt(10);
            };
            case DATE -> LocalDate.of(1900, 1, 1).plusDays(r.nextInt(60_000));
            case DATETIME -> LocalDateTime.of(1950, 1, 1, 0, 0).plusSeconds(r.nextInt(2_000_000_000));
        };
    }

    /** A random codebook with its cases and a compression, the same for the same seed. */
    record Drawn(DatasetCodebook codebook, List<Object[]> cases, SavWriter.Compression compression) {

        Path write(Path dir, String stem) throws IOException {
            Path file = dir.resolve(stem + (compression == SavWriter.Compression.ZLIB ? ".zsav" : ".sav"));
            SavWriter.write(file, codebook, cases, compression, SavWriterSamples.CREATED);
            return file;
        }
    }

    static Drawn draw(long seed) {
        Random r = new Random(seed);
        Set<String> taken = new HashSet<>();
        List<VariableMeta> vars = new ArrayList<>();
        for (int i = 1 + r.nextInt(12); i > 0; i--) {
            vars.add(variable(r, taken));
        }
        DatasetCodebook codebook = new DatasetCodebook("property", r.nextBoolean() ? null : text(r, 64), vars);
        List<Object[]> cases = new ArrayList<>();
        for (int i = r.nextInt(3) == 0 ? r.nextInt(2) : r.nextInt(60); i > 0; i--) {
            cases.add(vars.stream().map(v -> value(r, v)).toArray());
        }
        return new Drawn(codebook, cases, SavWriter.Compression.values()[(int) (seed % 3)]);
    }

    @ParameterizedTest(name = "seed {0}")
    @MethodSource("seeds")
    void whatTheReaderReadsIsWhatTheWriterWrote(long seed) throws IOException {
        Drawn drawn = draw(seed);
        DatasetCodebook written = drawn.codebook();
        List<VariableMeta> vars = written.variables();
        List<Object[]> cases = drawn.cases();
        Path file = drawn.write(dir, "p" + seed);

        try (CaseSource source = SavFiles.open(file)) {
            DatasetCodebook read = source.codebook();
            String title = written.title() == null || written.title().isEmpty() ? null : written.title();
            assertEquals(title, read.title() == null || read.title().isBlank() ? null : read.title().stripTrailing(),
                    "title");
            assertEquals(vars.size(), read.variables().size(), "variables");
            for (int i = 0; i < vars.size(); i++) {
                assertVariable(vars.get(i), read.variables().get(i));
            }
            Object[] row = new Object[vars.size()];
            for (int c = 0; c < cases.size(); c++) {
                assertTrue(source.next(row), "case " + (c + 1) + " of " + cases.size());
                assertArrayEquals(expected(vars, cases.get(c)), row, "case " + (c + 1));
            }
            assertFalse(source.next(row), "no case after the last");
        }
    }

    private static Object[] expected(List<VariableMeta> vars, Object[] written) {
        Object[] out = new Object[written.length];
        for (int i = 0; i < written.length; i++) {
            out[i] = vars.get(i).storage() == StorageType.TEXT && written[i] == null ? "" : written[i];
        }
        return out;
    }

    private static void assertVariable(VariableMeta w, VariableMeta r) {
        String at = w.name();
        assertEquals(w.name(), r.name(), "name");
        assertEquals(w.label(), r.label(), at + ": label");
        assertEquals(w.storage(), r.storage(), at + ": storage");
        if (w.storage() == StorageType.TEXT) {
            assertEquals(w.width(), r.width(), at + ": width");
        }
        assertEquals(w.measure(), r.measure(), at + ": measure");
        Map<String, String> labels = new LinkedHashMap<>();
        w.valueLabels().forEach((k, v) -> labels.put(k, v));
        assertEquals(labels, new LinkedHashMap<>(r.valueLabels()), at + ": value labels");
        assertEquals(w.missingCodes().stream().map(MissingCodeSpec::value).toList(),
                r.missingCodes().stream().map(MissingCodeSpec::value).toList(), at + ": missing values");
        assertEquals(w.missingRanges().stream().map(m -> List.of(String.valueOf(m.low()), String.valueOf(m.high())))
                        .toList(),
                r.missingRanges().stream().map(m -> List.of(String.valueOf(m.low()), String.valueOf(m.high())))
                        .toList(), at + ": missing ranges");
    }
}
