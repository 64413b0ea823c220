package org.wavewarden.load.spss;

import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.Measure;
import org.wavewarden.codebook.StorageType;
import org.wavewarden.codebook.VariableMeta;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.LocalDate;
import java.time.LocalDateTime;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.function.IntFunction;

/**
 * A household survey with a variable of every kind the writer handles, in any number of cases: value labels on
 * numbers, short, long and very long strings; one to three discrete missing values, closed and open ranges, a range
 * with a value, string missing values; long and non-ASCII names, some alike in their first 8 characters; 300+ byte
 * non-ASCII text; dates, date-times with fractions of a second; weights; numbers at the edges of bytecode compression.
 *
 * <p>Run {@link #main} to rewrite the committed fixture {@code sav-writer/household-5.sav}, then
 * {@code Rscript read-back.R household-5.haven.json household-5.sav} beside it for R's reading of it.
 */
final class SavWriterSamples {

    /** Every file of the fixture and of the live tests is stamped with this time, so the bytes repeat. */
    static final LocalDateTime CREATED = LocalDateTime.of(2026, 1, 15, 9, 30, 0);

    /**
     * One variable with what independent readers should report for it.
     *
     * @param meta         the codebook's variable
     * @param format       the SPSS format haven reports ({@code format.spss})
     * @param psppMeasure  the measurement level PSPP's DISPLAY DICTIONARY shows
     * @param psppMissing  the missing values PSPP's DISPLAY DICTIONARY shows
     * @param value        the variable's value in case i (0-based)
     */
    record Column(VariableMeta meta, String format, String psppMeasure, String psppMissing, IntFunction<Object> value) {
    }

    record Sample(String name, List<Column> columns, int cases) {

        DatasetCodebook codebook() {
            return new DatasetCodebook(name + ".sav", "Household survey, wave 3 – Süd", columns.stream()
                    .map(Column::meta).toList());
        }

        List<Object[]> rows() {
            List<Object[]> out = new ArrayList<>();
            for (int i = 0; i < cases; i++) {
                Object[] row = new Object[columns.size()];
                for (int c = 0; c < row.length; c++) {
                    row[c] = columns.get(c).value().apply(i);
                }
                out.add(row);
            }
            return out;
        }

        Path write(Path dir, SavWriter.Compression compression) throws IOException {
            Path file = dir.resolve(name + "-" + compression.name().toLowerCase()
                    + (compression == SavWriter.Compression.ZLIB ? ".zsav" : ".sav"));
            SavWriter.write(file, codebook(), rows(), compression, CREATED);
            return file;
        }
    }

    private SavWriterSamples() {
    }

    static Sample household(int cases) {
        return new Sample("household-" + cases, columns(), cases);
    }

    private static Object cycle(int i, Object... values) {
        return values[i % values.length];
    }

    private static Map<String, String> labels(String... pairs) {
        Map<String, String> out = new LinkedHashMap<>();
        for (int i = 0; i < pairs.length; i += 2) {
            out.put(pairs[i], pairs[i + 1]);
        }
        return out;
    }

    private static VariableMeta meta(String name, String label, StorageType storage, Integer width, Integer decimals,
                                     String format, Measure measure, Map<String, String> valueLabels,
                                     List<MissingCodeSpec> missing, List<MissingRangeSpec> ranges) {
        return new VariableMeta(name, label, storage, width, decimals, format, measure, null, valueLabels, missing,
                ranges, null);
    }

    private static List<MissingCodeSpec> codes(String... values) {
        return java.util.Arrays.stream(values).map(v -> new MissingCodeSpec(v, "no answer")).toList();
    }

    static final String LONG_TEXT = "Die Wohnung ist zu klein, die Miete steigt jedes Jahr – "
            + "äöüß€ ".repeat(25) + "Ende.";

    private static List<Column> columns() {
        List<Column> c = new ArrayList<>();
        c.add(new Column(meta("hh_id", "Household number", StorageType.NUMBER, null, 0, "F8.0", Measure.SCALE,
                null, null, null), "F8.0", "Scale", "", i -> (double) (i + 1)));
        c.add(new Column(meta("tenure", "Tenure of the home", StorageType.NUMBER, null, 0, null, Measure.NOMINAL,
                labels("1", "Owner", "2", "Council tenant", "3", "Private renter", "-9", "Refused",
                        "-8", "Don't know", "-7", "Not asked"), codes("-9", "-8", "-7"), null),
                "F8.0", "Nominal", "-9; -8; -7", i -> cycle(i, 1.0, 2.0, 3.0, -9.0, -8.0, -7.0, null)));
        c.add(new Column(meta("income_monthly_net_household_total_after_tax_and_transfers_eur",
                "Net monthly household income (EUR)", StorageType.NUMBER, null, 2, "F10.2", Measure.SCALE, null,
                codes("-1"), List.of(new MissingRangeSpec(-99.0, -91.0, "refused or unknown"))),
                "F10.2", "Scale", "-99 THRU -91; -1",
                i -> cycle(i, 1234.56, 0.1, -95.0, -1.0, 10000000.01, null, 2500.0)));
        c.add(new Column(meta("income_monthly_net_household_total_after_tax_and_transfers_gbp",
                "Net monthly household income (GBP)", StorageType.NUMBER, null, 2, "COMMA12.2", Measure.SCALE, null,
                null, List.of(new MissingRangeSpec(-99.0, -91.0, "refused or unknown"))),
                "COMMA12.2", "Scale", "-99 THRU -91", i -> i % 6 == 5 ? -92.0 : i * 100.25));
        c.add(new Column(meta("satisfaction_overall", "Overall satisfaction (0-10)", StorageType.NUMBER, null, 0,
                null, Measure.ORDINAL, labels("0", "Not at all satisfied", "10", "Completely satisfied",
                        "97", "Refused", "98", "Don't know"), null,
                List.of(new MissingRangeSpec(97.0, null, "no answer"))),
                "F8.0", "Ordinal", "97 THRU HIGHEST", i -> (double) (i % 13 <= 10 ? i % 13 : 86 + i % 13)));
        c.add(new Column(meta("age_at_interview", "Age at interview", StorageType.NUMBER, null, 0, null,
                Measure.SCALE, null, null, List.of(new MissingRangeSpec(null, -1.0, "no answer"))),
                "F8.0", "Scale", "LOWEST THRU -1", i -> cycle(i, 18.0 + i % 70, -1.0, -2.0, 99.0)));
        c.add(new Column(meta("region", "Region", StorageType.TEXT, 3, null, null, Measure.NOMINAL,
                labels("N", "North", "S", "Süd", "ÖS", "Östlich"), codes("X", "Y"), null),
                "A3", "Nominal", "\"X  \"; \"Y  \"", i -> cycle(i, "N", "S", "ÖS", "X", null, "", "Y")));
        c.add(new Column(meta("occupation_text", "Occupation as described", StorageType.TEXT, 40, null, null,
                Measure.NOMINAL, labels("Teacher", "Teacher (any level)", "Nurse", "Nursing staff"),
                codes("NA", "DK"), null),
                "A40", "Nominal", "\"NA      \"; \"DK      \"",
                i -> cycle(i, "Teacher", "Nurse", "Électricienne à la retraite", "NA", "DK", null)));
        c.add(new Column(meta("open_answer", "Was würden Sie an Ihrer Wohnung ändern?" + " (offene Angabe)".repeat(12),
                StorageType.TEXT, 400, null, null, Measure.NOMINAL, labels("none", "No answer given"), codes("none"),
                null), "A400", "Nominal", "\"none    \"", i -> cycle(i, LONG_TEXT, "none", "", null, "kurz")));
        c.add(new Column(meta("interview_date", "Date of interview", StorageType.DATE, null, null, "ADATE10",
                Measure.SCALE, null, null, null),
                "ADATE10", "Scale", "", i -> i % 9 == 8 ? null : LocalDate.of(2025, 1, 1).plusDays(7L * i)));
        c.add(new Column(meta("interview_start", "Start of interview", StorageType.DATETIME, null, null, null,
                Measure.SCALE, null, null, null),
                "DATETIME20", "Scale", "", i -> i % 7 == 6 ? null : LocalDateTime.of(2025, 1, 1, 9, 0)
                .plusMinutes(137L * i).plusSeconds(i).withNano(i % 5 == 2 ? 250_000_000 : 0)));
        c.add(new Column(meta("birth_date", "Date of birth", StorageType.DATE, null, null, null, Measure.SCALE,
                null, null, null), "DATE11", "Scale", "",
                i -> cycle(i, LocalDate.of(1582, 10, 15), LocalDate.of(1600, 2, 29), LocalDate.of(1970, 1, 1),
                        LocalDate.of(2000, 2, 29), null, LocalDate.of(1987, 6, 30))));
        c.add(new Column(meta("design_weight", "Design weight", StorageType.NUMBER, null, 4, null, Measure.SCALE,
                null, null, null), "F8.4", "Scale", "", i -> 0.5 + i * 0.0375));
        c.add(new Column(meta("größe_in_cm", "Körpergröße (cm)", StorageType.NUMBER, null, 1, null, Measure.SCALE,
                null, null, null), "F8.1", "Scale", "", i -> 150.5 + i));
        c.add(new Column(meta("consent", "Consent to recontact", StorageType.NUMBER, null, 0, "F1.0",
                Measure.NOMINAL, labels("0", "No", "1", "Yes", "9", "Not asked"), codes("9"), null),
                "F1.0", "Nominal", "9", i -> cycle(i, 1.0, 0.0, 9.0)));
        c.add(new Column(meta("bytecode_probe", null, StorageType.NUMBER, null, 2, null, Measure.UNKNOWN,
                null, null, null), "F8.2", "Nominal", "",
                i -> cycle(i, -100.0, -99.0, 0.0, 151.0, 152.0, 2.5, 1e12, -1e-300, null, Double.NaN, 7L, 3)));
        return List.copyOf(c);
    }

    /** Rewrites the committed fixture: {@code java ... SavWriterSamples monitor/src/test/resources/sav-writer}. */
    public static void main(String[] args) throws IOException {
        Path dir = Path.of(args[0]);
        Files.createDirectories(dir);
        Path written = household(5).write(dir, SavWriter.Compression.BYTECODE);
        Files.move(written, dir.resolve("household-5.sav"), java.nio.file.StandardCopyOption.REPLACE_EXISTING);
    }
}
