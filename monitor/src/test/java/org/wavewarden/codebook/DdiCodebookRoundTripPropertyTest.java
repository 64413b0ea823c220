package org.wavewarden.codebook;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.config.RangeSpec;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import java.util.Set;
import java.util.stream.LongStream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Write then read: for random codebooks (seeded, so a failure repeats), {@link DdiCodebook#read} of what
 * {@link DdiCodebook#write} wrote is the codebook written, field by field and in order. The codebooks hold what
 * survey codebooks hold and what breaks naive XML: labels, units and codes with markup, entity and CDATA look-alikes,
 * quotes and characters outside the Basic Multilingual Plane; missing codes with and without value labels and with
 * reasons other than their labels; missing and valid ranges with an open end; text, date and date-time variables
 * with and without a format.
 *
 * <p>What the document cannot hold is left out of the generated codebooks on purpose and stated in
 * {@link DdiCodebook#write}: white space inside text is collapsed on reading (every generated text has single spaces
 * and none at its ends), and declared missing values come back in the order of the categories (labelled codes where
 * their labels stand, then the unlabelled ones), which is the order generated here.
 */
class DdiCodebookRoundTripPropertyTest {

    private static final String[] HOSTILE = {
            "Owner", "Council tenant", "<b>bold</b>", "Tom & Jerry", "\"quoted\"", "'single'", "]]>", "<![CDATA[x]]>",
            "<!-- not a comment -->", "&amp;", "&#60;", "&e;", "<?xml version=\"1.0\"?>", "<!DOCTYPE x>",
            "a > b", "5 < 6", "don't know", "Ålesund", "Straße", "\u0645\u0644\u0643", "\uD83C\uDFE0 home",
            "\uD835\uDD18\uD835\uDD2B\uD835\uDD26", "e\u0301t\u00E9", "no\u00A0break", "50%", "#1", "x: y", "{a}",
            "$HOME", "\\n", "tab\\t", "1.0"};
    private static final String[] TEXT_CODES = {"DK", "REF", "<na>", "A&B", "\"x\"", "ü", "\uD83C\uDFE0", "a b",
            "0", "-9", "1.0", "]]>"};
    private static final String[] NAMES = {"q1", "Q1.a", "tenure", "eta\u0300", "x_y", "income", "W1_2", "v",
            "region", "start_date"};
    private static final String[] DATE_FORMATS = {"DATE11", "ADATE10", "EDATE10", "SDATE10"};
    private static final String[] DATETIME_FORMATS = {"DATETIME20", "YMDHMS19"};

    static LongStream seeds() {
        return LongStream.rangeClosed(1, 200);
    }

    @ParameterizedTest(name = "seed {0}")
    @MethodSource("seeds")
    void readingWhatWasWrittenGivesTheCodebookBack(long seed, @TempDir Path dir) throws IOException {
        DatasetCodebook written = codebook(new Random(seed));
        Path file = dir.resolve("codebook.xml");
        Files.writeString(file, DdiCodebookWriteTest.write(written), StandardCharsets.UTF_8);
        DatasetCodebook read = DdiCodebook.read(file);
        assertEquals(written.title(), read.title());
        assertEquals(written.variables().size(), read.variables().size());
        for (int i = 0; i < written.variables().size(); i++) {
            VariableMeta w = written.variables().get(i);
            VariableMeta r = read.variables().get(i);
            assertEquals(w, r, "seed " + seed + ", variable " + w.name());
            // a map's equality ignores order; the codebook's order of value labels is part of what it says
            assertEquals(List.copyOf(w.valueLabels().keySet()), List.copyOf(r.valueLabels().keySet()), w.name());
        }
    }

    /** The generator reaches every case it is meant to: a property over too few kinds of variable proves little. */
    @Test
    void theGeneratedCodebooksCoverEveryKindOfVariableAndDeclaration() {
        Set<String> seen = new HashSet<>();
        seeds().forEach(seed -> {
            for (VariableMeta v : codebook(new Random(seed)).variables()) {
                seen.add(v.storage() + (v.format() == null ? " without format" : " with format"));
                for (MissingRangeSpec m : v.missingRanges()) {
                    seen.add(m.low() == null ? "range open below" : m.high() == null ? "range open above" : "range");
                }
                for (MissingCodeSpec m : v.missingCodes()) {
                    String label = v.valueLabels().get(m.value());
                    seen.add(label == null ? "unlabelled missing code" : label.equals(m.reason())
                            ? "missing code labelled with its reason" : "missing code with another reason");
                }
                if (v.validRange() != null) {
                    seen.add(v.validRange().min() == null || v.validRange().max() == null ? "open valid range"
                            : "valid range");
                }
            }
        });
        for (StorageType s : StorageType.values()) {
            for (String f : List.of(" with format", " without format")) {
                assertTrue(seen.contains(s + f), s + f + " among " + seen);
            }
        }
        for (String s : List.of("range", "range open below", "range open above", "unlabelled missing code",
                "missing code labelled with its reason", "missing code with another reason", "valid range",
                "open valid range")) {
            assertTrue(seen.contains(s), s + " among " + seen);
        }
    }

    // ---- the generator --------------------------------------------------------------------------------------

    static DatasetCodebook codebook(Random rnd) {
        List<VariableMeta> vars = new ArrayList<>();
        Set<String> names = new HashSet<>();
        int n = 1 + rnd.nextInt(8);
        for (int i = 0; i < n; i++) {
            String name = NAMES[rnd.nextInt(NAMES.length)];
            if (!names.add(name.toLowerCase(Locale.ROOT))) {
                name = name + "_" + i;
                names.add(name.toLowerCase(Locale.ROOT));
            }
            vars.add(variable(rnd, name));
        }
        return new DatasetCodebook("survey.sav", text(rnd), vars);
    }

    private static VariableMeta variable(Random rnd, String name) {
        StorageType storage = StorageType.values()[rnd.nextInt(StorageType.values().length)];
        boolean formatted = rnd.nextBoolean();
        Integer width = null;
        Integer decimals = rnd.nextInt(4) == 0 ? rnd.nextInt(4) : null;
        String format = null;
        switch (storage) {
            case NUMBER -> {
                if (formatted) {
                    decimals = rnd.nextInt(4);
                    format = "F" + (decimals + 1 + rnd.nextInt(10)) + "." + decimals;
                }
            }
            case TEXT -> {
                if (formatted) {
                    width = 1 + rnd.nextInt(rnd.nextBoolean() ? 8 : 32767);
                    format = "A" + width;
                }
            }
            case DATE -> format = formatted ? DATE_FORMATS[rnd.nextInt(DATE_FORMATS.length)] : null;
            case DATETIME -> format = formatted ? DATETIME_FORMATS[rnd.nextInt(DATETIME_FORMATS.length)] : null;
        }
        Measure measure = Measure.values()[rnd.nextInt(Measure.values().length)];
        String label = rnd.nextInt(5) == 0 ? null : text(rnd);
        String unit = rnd.nextInt(3) == 0 ? text(rnd) : null;

        Map<String, String> labels = new LinkedHashMap<>();
        List<MissingCodeSpec> labelledMissing = new ArrayList<>();
        List<MissingCodeSpec> unlabelledMissing = new ArrayList<>();
        if (storage == StorageType.NUMBER || storage == StorageType.TEXT) {
            Set<String> used = new HashSet<>();
            int codes = rnd.nextInt(7);
            for (int i = 0; i < codes; i++) {
                String code = storage == StorageType.TEXT ? TEXT_CODES[rnd.nextInt(TEXT_CODES.length)]
                        : Codes.of(rnd.nextInt(3) == 0 ? (rnd.nextInt(2001) - 1000) / 4.0 : rnd.nextInt(199) - 99);
                if (!used.add(code)) {
                    continue;
                }
                boolean labelled = rnd.nextInt(4) != 0;
                boolean missing = rnd.nextInt(3) == 0;
                if (labelled) {
                    String codeLabel = text(rnd);
                    labels.put(code, codeLabel);
                    if (missing) {
                        labelledMissing.add(new MissingCodeSpec(code, rnd.nextBoolean() ? codeLabel : text(rnd)));
                    }
                } else if (missing) {
                    unlabelledMissing.add(new MissingCodeSpec(code, text(rnd)));
                }
            }
        }
        List<MissingCodeSpec> missing = new ArrayList<>(labelledMissing);
        missing.addAll(unlabelledMissing);

        List<MissingRangeSpec> ranges = new ArrayList<>();
        RangeSpec valid = null;
        if (storage == StorageType.NUMBER) {
            int k = rnd.nextInt(3);
            for (int i = 0; i < k; i++) {
                double a = number(rnd);
                double b = a + Math.abs(number(rnd));
                switch (rnd.nextInt(3)) {
                    case 0 -> ranges.add(new MissingRangeSpec(null, b, text(rnd)));
                    case 1 -> ranges.add(new MissingRangeSpec(a, null, text(rnd)));
                    default -> ranges.add(new MissingRangeSpec(a, b, text(rnd)));
                }
            }
            if (rnd.nextBoolean()) {
                double a = number(rnd);
                double b = a + Math.abs(number(rnd));
                valid = switch (rnd.nextInt(3)) {
                    case 0 -> new RangeSpec(null, b);
                    case 1 -> new RangeSpec(a, null);
                    default -> new RangeSpec(a, b);
                };
            }
        }
        return new VariableMeta(name, label, storage, width, decimals, format, measure, unit, labels, missing,
                ranges, valid);
    }

    /** Whole numbers, quarters and arbitrary doubles, as SPSS codes and range ends come. */
    private static double number(Random rnd) {
        return switch (rnd.nextInt(3)) {
            case 0 -> rnd.nextInt(2001) - 1000;
            case 1 -> (rnd.nextInt(4001) - 2000) / 4.0;
            default -> (rnd.nextDouble() - 0.5) * Math.pow(10, rnd.nextInt(12));
        };
    }

    /** One to three pieces joined by single spaces: the white space a codebook's text keeps. */
    private static String text(Random rnd) {
        int k = 1 + rnd.nextInt(3);
        StringBuilder sb = new StringBuilder();
        for (int i = 0; i < k; i++) {
            sb.append(i == 0 ? "" : " ").append(HOSTILE[rnd.nextInt(HOSTILE.length)]);
        }
        return sb.toString();
    }
}
