package org.wavewarden.codebook;

import org.wavewarden.config.ConnectionConfig;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.config.RangeSpec;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.load.TableShape;
import org.wavewarden.missing.ValidNumber;
import org.wavewarden.missing.VariableInference;
import org.wavewarden.missing.VariableScreen;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.read.SourceColumn;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.regex.Pattern;

/**
 * A complete, annotated configuration for one table, written from its codebook and its newest wave: every column of
 * the table is either a variable (with kind, unit, label, value labels, missing codes and ranges, valid range) or a
 * bookkeeping column, and a comment beside each says where the choice came from. The codebook decides where it
 * speaks; the rest is inferred from the wave's tallies as an undeclared variable is inferred in a run
 * ({@link VariableInference}), so the scaffold declares what a run would otherwise guess.
 *
 * <p>Every scalar is written as a YAML double-quoted string or a plain number, and every data-derived text in a
 * comment is written in that quoted form too, so labels with quotes, colons, {@code #}, line breaks or any other
 * character cannot change the file's structure.
 */
public final class ConfigScaffold {

    /**
     * Names that read as a survey weight (common practice, no source): {@code weight}, {@code wt}, {@code wgt},
     * {@code wght}, alone or as a part between underscores, with a trailing number ({@code wt2}).
     */
    static final Pattern WEIGHT_NAME = Pattern.compile("(?i)(.*_)?(weight|weights|wt|wgt|wght)\\d*(_.*)?");
    /**
     * Names that read as a respondent or record identifier (common practice, no source): {@code id}, anything ending
     * in {@code _id} or {@code id} after a known stem ({@code respid}, {@code caseid}), {@code serial}.
     */
    static final Pattern KEY_NAME = Pattern.compile(
            "(?i)(id|.*_id|resp(ondent)?_?id|case_?id|record_?id|serial(_?no)?|respondent)");

    private ConfigScaffold() {
    }

    /**
     * What the scaffold is written from.
     *
     * @param source       the source connection as configured (the password stays where it lives)
     * @param results      the results schema and connection as configured
     * @param dataset      the dataset's name
     * @param table        the table ({@code schema.table}), or the pattern of a table per wave
     *                     ({@code pulse.wave_{wave}})
     * @param waveColumn   the wave column
     * @param columns      every column of the table, in table order
     * @param wave         the newest wave with rows, whose tallies are given
     * @param tallies      the newest wave's tallies by column, read as a run reads a wave
     * @param codebook     the codebook, or null without one
     * @param weightColumn a weight column already configured, or null
     * @param respondentKey a respondent key already configured, or null
     * @param exclude      columns already excluded
     */
    public record Input(ConnectionConfig source, WardenConfig.ResultsConfig results, String dataset, String table,
                        String waveColumn, List<SourceColumn> columns, String wave, Map<String, ColumnTally> tallies,
                        DatasetCodebook codebook, String weightColumn, String respondentKey, List<String> exclude) {

        public Input {
            columns = List.copyOf(columns);
            tallies = Map.copyOf(tallies);
            exclude = exclude == null ? List.of() : List.copyOf(exclude);
        }
    }

    /** One variable as scaffolded, with the comment saying where its kind came from. */
    record Scaffolded(VariableConfig variable, String origin, String note, RangeSpec observed) {
    }

    /** The configuration as YAML text. */
    public static String yaml(Input in) {
        StringBuilder y = new StringBuilder();
        y.append("# Written by wavewarden scaffold from table ").append(in.table()).append(", newest wave ")
                .append(quote(in.wave())).append(in.codebook() == null ? ", without a codebook"
                        : ", codebook " + quote(in.codebook().source())).append(".\n");
        y.append("# Every column of the table is below: as a variable, or as a bookkeeping column with the reason.\n");
        y.append("# Comments say where each kind came from; edit what is wrong, then run wavewarden check.\n");
        y.append("source:\n");
        connection(y, "  ", in.source());
        y.append("results:\n");
        if (in.results().connection() != null) {
            connection(y, "  ", in.results().connection());
        }
        y.append("  schema: ").append(quote(in.results().schema())).append('\n');
        y.append("datasets:\n");
        y.append("  - name: ").append(quote(in.dataset())).append('\n');
        // A table per wave is named by its pattern, which holds the wave's place as {wave}.
        y.append(in.table().contains("{wave}") ? "    tablePattern: " : "    table: ").append(quote(in.table()))
                .append('\n');
        if (in.waveColumn() != null) {
            y.append("    waveColumn: ").append(quote(in.waveColumn())).append('\n');
        }

        String weight = in.weightColumn();
        String weightWhy = weight == null ? null : "as configured";
        String key = in.respondentKey();
        Map<String, String> excluded = new LinkedHashMap<>();
        in.exclude().forEach(c -> excluded.put(c, "as configured"));
        List<Scaffolded> variables = new ArrayList<>();
        List<String> notes = new ArrayList<>();
        for (SourceColumn c : in.columns()) {
            String name = c.name();
            if (name.equals(in.waveColumn()) || name.equals(weight) || name.equals(key) || excluded.containsKey(name)) {
                continue;
            }
            if (!Identifiers.isPlain(name)) {
                notes.add("column " + quote(name) + " is not a plain SQL identifier and cannot be monitored; rename it");
                continue;
            }
            Optional<VariableMeta> meta = meta(in.codebook(), name);
            String label = meta.map(VariableMeta::label).orElse(null);
            boolean weightLike = WEIGHT_NAME.matcher(name).matches()
                    || (label != null && label.toLowerCase(Locale.ROOT).contains("weight"));
            if (weightLike && c.type().isNumeric()) {
                if (weight == null) {
                    weight = name;
                    weightWhy = WEIGHT_NAME.matcher(name).matches() ? "its name reads as a survey weight"
                            : "the codebook labels it " + quote(label);
                } else {
                    excluded.put(name, "another weight (" + weight + " weights the estimates)");
                }
                continue;
            }
            if (KEY_NAME.matcher(name).matches()) {
                excluded.put(name, "its name reads as a respondent identifier; for a panel make it respondentKey");
                continue;
            }
            variables.add(variable(c, in.tallies().get(name), meta.orElse(null), in.wave()));
        }
        if (weight != null) {
            y.append("    weightColumn: ").append(quote(weight)).append("  # ").append(weightWhy).append('\n');
        }
        if (key != null) {
            y.append("    respondentKey: ").append(quote(key)).append("  # as configured\n");
        }
        if (!excluded.isEmpty()) {
            y.append("    exclude:\n");
            excluded.forEach((c, why) -> y.append("      - ").append(quote(c)).append("  # ").append(why).append('\n'));
        }
        if (in.codebook() != null) {
            Set<String> columns = new HashSet<>();
            in.columns().forEach(c -> columns.add(c.name()));
            for (VariableMeta m : in.codebook().variables()) {
                if (!columns.contains(m.name()) && in.columns().stream().noneMatch(c -> matches(m, c.name()))) {
                    notes.add("the codebook's variable " + quote(m.name()) + " has no column in the table");
                }
            }
        }
        notes.forEach(n -> y.append("    # ").append(n).append('\n'));
        y.append("    variables:").append(variables.isEmpty() ? " []  # no column left to monitor\n" : "\n");
        for (Scaffolded s : variables) {
            write(y, s);
        }
        return y.toString();
    }

    private static void connection(StringBuilder y, String indent, ConnectionConfig c) {
        y.append(indent).append("jdbcUrl: ").append(quote(c.jdbcUrl())).append('\n');
        if (c.user() != null) {
            y.append(indent).append("user: ").append(quote(c.user())).append('\n');
        }
        if (c.passwordEnv() != null) {
            y.append(indent).append("passwordEnv: ").append(quote(c.passwordEnv())).append('\n');
        }
        if (c.passwordFile() != null) {
            y.append(indent).append("passwordFile: ").append(quote(c.passwordFile())).append('\n');
        }
    }

    static Optional<VariableMeta> meta(DatasetCodebook codebook, String column) {
        if (codebook == null) {
            return Optional.empty();
        }
        Optional<VariableMeta> m = codebook.variable(column);
        return m.isPresent() ? m : codebook.variables().stream().filter(v -> matches(v, column)).findFirst();
    }

    /**
     * Whether a numeric variable's answers are all value-labelled codes: at least two labelled valid codes, and every
     * answer of the wave not declared missing is one of them (matched as numbers).
     */
    static boolean allAnswersLabelled(ColumnTally tally, org.wavewarden.missing.Codebook declared, ColumnType type,
                                      Map<String, String> labels, List<String> valid) {
        if (tally == null || valid.size() < 2) {
            return false;
        }
        CodeLabels named = new CodeLabels(null, labels);
        return tally.valueCounts().keySet().stream().filter(x -> declared.reasonOf(x, type).isEmpty())
                .allMatch(x -> named.label(x) != null);
    }

    /** A codebook name matches the column the import made of it. */
    private static boolean matches(VariableMeta m, String column) {
        return TableShape.columnName(m.name()).equals(column);
    }

    /** One column's variable: the codebook's kind where it gives one that fits the column, else the inferred one. */
    static Scaffolded variable(SourceColumn c, ColumnTally tally, VariableMeta m, String wave) {
        ColumnType type = c.type();
        boolean numeric = type.isNumeric();
        List<MissingCodeSpec> codes = m == null ? List.of() : distinct(m.missingCodes());
        List<MissingRangeSpec> ranges = m == null ? List.of() : m.missingRanges().stream()
                .map(r -> r.reason() == null || r.reason().isBlank()
                        ? new MissingRangeSpec(r.low(), r.high(), "missing range") : r).toList();
        Map<String, String> labels = m == null ? Map.of() : m.valueLabels();
        String note = null;
        VariableKind kind = null;
        String origin = null;
        List<String> levels = List.of();
        if (m != null) {
            boolean dated = type == ColumnType.DATE || type == ColumnType.TIMESTAMP;
            if (m.storage() == StorageType.DATE || m.storage() == StorageType.DATETIME) {
                if (dated) {
                    kind = VariableKind.DATE;
                    origin = "codebook: " + m.storage().name().toLowerCase(Locale.ROOT) + " values";
                }
            } else {
                org.wavewarden.missing.Codebook declared = VariableScreen.codebook(new VariableConfig(c.name(),
                        VariableKind.CATEGORICAL, null, null, codes, null, null, List.of(), null, null, null, null,
                        numeric ? ranges : List.of()));
                ColumnType asType = numeric ? ColumnType.DECIMAL : ColumnType.TEXT;
                List<String> valid = new ArrayList<>(labels.keySet());
                valid.removeIf(code -> declared.reasonOf(code, asType).isPresent());
                // Two labelled answers make a binary variable only if the wave uses no other answer.
                boolean two = valid.size() == 2 && (tally == null || tally.valueCounts().keySet().stream()
                        .filter(x -> declared.reasonOf(x, type).isEmpty()).count() <= 2);
                switch (m.measure()) {
                    case SCALE -> {
                        if (numeric && allAnswersLabelled(tally, declared, type, labels, valid)) {
                            // Files written without a measurement level (haven writes every number as scale) still
                            // say what a code is by labelling every answer: such a variable is a set of codes.
                            kind = two ? VariableKind.BINARY : VariableKind.CATEGORICAL;
                            origin = "codebook: scale, but every answer in wave " + quote(wave) + " is one of its "
                                    + valid.size() + " labelled codes";
                        } else if (numeric) {
                            kind = VariableKind.CONTINUOUS;
                            origin = "codebook: scale";
                        }
                    }
                    case ORDINAL -> {
                        if (numeric) {
                            kind = VariableKind.ORDINAL;
                            origin = "codebook: ordinal";
                        } else if (!valid.isEmpty()) {
                            kind = VariableKind.ORDINAL;
                            levels = valid;
                            origin = "codebook: ordinal, levels in the order of its value labels";
                        }
                    }
                    case NOMINAL -> {
                        kind = two ? VariableKind.BINARY : VariableKind.CATEGORICAL;
                        origin = two ? "codebook: nominal with 2 labelled answers" : "codebook: nominal";
                    }
                    case UNKNOWN -> {
                    }
                }
            }
            if (kind == null && m.measure() != Measure.UNKNOWN) {
                note = "the codebook's " + m.measure().name().toLowerCase(Locale.ROOT) + " does not fit the "
                        + c.postgresType() + " column";
            }
        }
        VariableConfig declared = new VariableConfig(c.name(), kind == null ? VariableKind.TEXT : kind, null, null,
                codes, null, null, levels, null, null, null, null, numeric ? ranges : List.of());
        String unit = m == null ? null : m.unit();
        if (kind == null) {
            if (tally == null) {
                kind = VariableKind.TEXT;
                origin = "not read in wave " + quote(wave) + " (" + c.postgresType() + "): screened as text";
            } else {
                // Inferred on the answers the codebook leaves, as the run would screen them.
                ColumnTally answers = VariableScreen.codebook(declared).split(tally).validOnly();
                VariableInference.Inferred i = VariableInference.infer(answers);
                kind = i.variable().kind();
                origin = "inferred: " + i.reason() + " in wave " + quote(wave);
                unit = unit != null ? unit : i.variable().unit();
            }
        }
        if (kind == VariableKind.TEXT || kind == VariableKind.DATE) {
            if (!ranges.isEmpty()) {
                note = (note == null ? "" : note + "; ") + "its missing ranges are left out: a " + kind.configName()
                        + " variable has none";
            }
            ranges = List.of();
        }
        if (!numeric) {
            ranges = List.of();
        }
        boolean scale = kind == VariableKind.CONTINUOUS || kind == VariableKind.ORDINAL;
        RangeSpec range = scale && m != null ? m.validRange() : null;
        VariableConfig v = new VariableConfig(c.name(), kind, unit, range, codes, null, null, levels, null, null,
                m == null ? null : m.label(), labels, ranges);
        RangeSpec observed = scale && range == null && levels.isEmpty() && tally != null ? observed(v, tally) : null;
        return new Scaffolded(v, origin, note, observed);
    }

    /** The smallest and largest valid answers of the wave, by the one rule for a valid number. */
    private static RangeSpec observed(VariableConfig v, ColumnTally tally) {
        ValidNumber rule = ValidNumber.of(v);
        Double min = null;
        Double max = null;
        for (String value : tally.valueCounts().keySet()) {
            if (rule.status(value) == ValidNumber.Status.VALID) {
                double x = rule.value(value);
                min = min == null || x < min ? x : min;
                max = max == null || x > max ? x : max;
            }
        }
        return min == null ? null : new RangeSpec(min, max);
    }

    /**
     * The codebook's codes with a value listed twice kept once (the first reason), as the screen needs, and a blank
     * reason given the loader's default, as the loader would.
     */
    private static List<MissingCodeSpec> distinct(List<MissingCodeSpec> codes) {
        Map<String, MissingCodeSpec> out = new LinkedHashMap<>();
        for (MissingCodeSpec c : codes) {
            out.putIfAbsent(c.value().strip(), c.reason() == null || c.reason().isBlank()
                    ? new MissingCodeSpec(c.value(), "missing code") : c);
        }
        return List.copyOf(out.values());
    }

    private static void write(StringBuilder y, Scaffolded s) {
        VariableConfig v = s.variable();
        String i = "        ";
        y.append("      - name: ").append(quote(v.name())).append('\n');
        y.append(i).append("kind: ").append(v.kind().configName()).append("  # ").append(s.origin()).append('\n');
        if (s.note() != null) {
            y.append(i).append("# ").append(s.note()).append('\n');
        }
        if (v.label() != null && !v.label().isBlank()) {
            y.append(i).append("label: ").append(quote(v.label())).append('\n');
        }
        if (v.unit() != null) {
            y.append(i).append("unit: ").append(quote(v.unit())).append('\n');
        }
        if (!v.levels().isEmpty()) {
            y.append(i).append("levels: [");
            for (int k = 0; k < v.levels().size(); k++) {
                y.append(k == 0 ? "" : ", ").append(quote(v.levels().get(k)));
            }
            y.append("]\n");
        }
        if (v.range() != null) {
            y.append(i).append("range: ").append(range(v.range())).append("  # codebook: valid range\n");
        } else if (s.observed() != null) {
            y.append(i).append("# range: ").append(range(s.observed())).append("  # observed in wave; uncomment to"
                    + " declare the valid range\n");
        }
        if (!v.valueLabels().isEmpty()) {
            y.append(i).append("valueLabels:\n");
            // A blank label says nothing of its code and the loader refuses it, so it is left out.
            v.valueLabels().forEach((code, label) -> y.append(i).append(label.isBlank() ? "  # " : "  ")
                    .append(quote(code)).append(": ").append(quote(label)).append('\n'));
        }
        if (!v.missingCodes().isEmpty()) {
            y.append(i).append("missingCodes:\n");
            for (MissingCodeSpec c : v.missingCodes()) {
                y.append(i).append("  - {value: ").append(quote(c.value())).append(", reason: ")
                        .append(quote(c.reason())).append("}\n");
            }
        }
        if (!v.missingRanges().isEmpty()) {
            y.append(i).append("missingRanges:\n");
            for (MissingRangeSpec r : v.missingRanges()) {
                y.append(i).append("  - {");
                if (r.low() != null) {
                    y.append("min: ").append(Codes.of(r.low())).append(", ");
                }
                if (r.high() != null) {
                    y.append("max: ").append(Codes.of(r.high())).append(", ");
                }
                y.append("reason: ").append(quote(r.reason())).append("}\n");
            }
        }
    }

    private static String range(RangeSpec r) {
        List<String> parts = new ArrayList<>();
        if (r.min() != null) {
            parts.add("min: " + Codes.of(r.min()));
        }
        if (r.max() != null) {
            parts.add("max: " + Codes.of(r.max()));
        }
        return "{" + String.join(", ", parts) + "}";
    }

    /**
     * A YAML double-quoted scalar of any text: backslash and double quote escaped, and every character YAML reads as
     * a line break, a control character or a byte-order mark written as an escape, so that the text is one line
     * and reads back exactly. Other characters (accents, CJK, emoji) are written as they are, in UTF-8.
     */
    public static String quote(String text) {
        if (text == null) {
            return "null";
        }
        StringBuilder out = new StringBuilder(text.length() + 2).append('"');
        for (int k = 0; k < text.length(); k++) {
            char ch = text.charAt(k);
            switch (ch) {
                case '"' -> out.append("\\\"");
                case '\\' -> out.append("\\\\");
                case '\n' -> out.append("\\n");
                case '\r' -> out.append("\\r");
                case '\t' -> out.append("\\t");
                default -> {
                    boolean escape = ch < 0x20 || (ch >= 0x7F && ch <= 0x9F) || ch == '\u2028' || ch == '\u2029'
                            || ch == '\uFEFF' || ch == '\uFFFE' || ch == '\uFFFF';
                    if (Character.isSurrogate(ch) && !pairedSurrogate(text, k)) {
                        out.append('\uFFFD'); // half a character cannot be written in UTF-8 at all
                    } else if (escape) {
                        out.append(String.format(Locale.ROOT, "\\u%04X", (int) ch));
                    } else {
                        out.append(ch);
                    }
                }
            }
        }
        return out.append('"').toString();
    }

    private static boolean pairedSurrogate(String s, int k) {
        char ch = s.charAt(k);
        if (Character.isHighSurrogate(ch)) {
            return k + 1 < s.length() && Character.isLowSurrogate(s.charAt(k + 1));
        }
        return k > 0 && Character.isHighSurrogate(s.charAt(k - 1));
    }
}
