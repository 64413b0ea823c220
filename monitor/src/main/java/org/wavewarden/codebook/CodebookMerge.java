package org.wavewarden.codebook;

import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.RangeSpec;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.function.Predicate;

/**
 * A dataset's YAML variables merged with a codebook: the YAML wins field by field, the codebook fills what it leaves
 * out. A YAML variable takes from its codebook entry the label, the value labels, the missing codes (only when the
 * YAML lists none), the missing ranges (likewise), the unit and the valid range (for continuous and ordinal
 * variables). A variable only the codebook describes is added after the YAML's, in codebook order, with the kind
 * {@link #kindOf} gives; when that is unknown its kind is left null, for {@code missing.VariableInference} to decide
 * from the data. Codebook variables are matched to the YAML and named in the table's form of {@link ColumnNames}.
 */
public final class CodebookMerge {

    private CodebookMerge() {
    }

    /**
     * @param variables the merged variables: the YAML's first, in their order, then the codebook's others
     * @param report    one printable line per decision
     */
    public record Merged(List<VariableConfig> variables, List<String> report) {
    }

    /**
     * The kind a codebook entry gives a variable, with why.
     *
     * @param kind null when the codebook cannot tell (numbers of unknown level without value labels)
     * @param why  the codebook's words, for the report ("codebook: nominal")
     */
    public record KindFromCodebook(VariableKind kind, String why) {
    }

    /** {@link #merge(List, DatasetCodebook, Predicate)} with no bookkeeping column. */
    public static Merged merge(List<VariableConfig> yaml, DatasetCodebook codebook) {
        return merge(yaml, codebook, column -> false);
    }

    /**
     * @param bookkeeping the dataset's wave, weight, respondent key, design and excluded columns: never added as
     *                    variables, whatever the codebook says of them
     */
    public static Merged merge(List<VariableConfig> yaml, DatasetCodebook codebook, Predicate<String> bookkeeping) {
        List<VariableConfig> out = new ArrayList<>();
        List<String> report = new ArrayList<>();
        Set<VariableMeta> used = new HashSet<>();
        for (VariableConfig v : yaml) {
            VariableMeta m = entry(codebook, v.name());
            if (m == null) {
                out.add(v);
                report.add(v.name() + ": not in the codebook; as the YAML says");
                continue;
            }
            used.add(m);
            out.add(fill(v, m, report));
        }
        for (VariableMeta m : codebook.variables()) {
            String column = ColumnNames.of(m.name());
            if (used.contains(m) || out.stream().anyMatch(v -> v.name().equals(column))) {
                continue;
            }
            if (bookkeeping.test(column)) {
                report.add(column + ": bookkeeping column of the dataset; not added as a variable");
                continue;
            }
            out.add(added(column, m, report));
        }
        return new Merged(out, report);
    }

    /**
     * The one rule for the kind a codebook entry gives: dates are dates; text is categorical with value labels or a
     * nominal level (ordinal with its labelled codes as the levels), free text otherwise; numbers follow the
     * declared level (nominal categorical, ordinal ordinal, scale continuous), and without a level they are
     * categorical when codes other than the missing ones carry labels, else unknown.
     */
    public static KindFromCodebook kindOf(VariableMeta m) {
        if (m.storage() == StorageType.DATE || m.storage() == StorageType.DATETIME) {
            return new KindFromCodebook(VariableKind.DATE, "codebook: " + (m.storage() == StorageType.DATE ? "date"
                    : "date-time") + " values");
        }
        boolean labelled = !answerLabels(m).isEmpty();
        if (m.storage() == StorageType.TEXT) {
            if (m.measure() == Measure.ORDINAL && labelled) {
                return new KindFromCodebook(VariableKind.ORDINAL, "codebook: ordinal text with labelled codes");
            }
            if (labelled || m.measure() == Measure.NOMINAL) {
                return new KindFromCodebook(VariableKind.CATEGORICAL, m.measure() == Measure.NOMINAL
                        ? "codebook: nominal" : "codebook: text with value labels");
            }
            return new KindFromCodebook(VariableKind.TEXT, "codebook: text without value labels");
        }
        return switch (m.measure()) {
            case NOMINAL -> new KindFromCodebook(VariableKind.CATEGORICAL, "codebook: nominal");
            case ORDINAL -> new KindFromCodebook(VariableKind.ORDINAL, "codebook: ordinal");
            case SCALE -> new KindFromCodebook(VariableKind.CONTINUOUS, "codebook: scale");
            case UNKNOWN -> labelled
                    ? new KindFromCodebook(VariableKind.CATEGORICAL, "codebook: numbers of unknown level with value"
                    + " labels")
                    : new KindFromCodebook(null, "codebook: numbers of unknown level without value labels");
        };
    }

    /** The value labels of codes that are answers, not declared missing. */
    private static Map<String, String> answerLabels(VariableMeta m) {
        Map<String, String> out = new java.util.LinkedHashMap<>(m.valueLabels());
        m.missingCodes().forEach(c -> out.remove(c.value()));
        return out;
    }

    private static VariableMeta entry(DatasetCodebook codebook, String name) {
        VariableMeta m = codebook.variable(name).orElse(null);
        if (m != null) {
            return m;
        }
        return codebook.variables().stream().filter(x -> ColumnNames.of(x.name()).equals(name)).findFirst()
                .orElse(null);
    }

    private static VariableConfig fill(VariableConfig v, VariableMeta m, List<String> report) {
        List<String> taken = new ArrayList<>();
        String label = v.label();
        if (label == null && m.label() != null) {
            label = m.label();
            taken.add("label");
        }
        Map<String, String> labels = v.valueLabels();
        if (labels.isEmpty() && !m.valueLabels().isEmpty()) {
            labels = m.valueLabels();
            taken.add(count(labels.size(), "value label"));
        }
        List<MissingCodeSpec> codes = v.missingCodes();
        List<String> kept = new ArrayList<>();
        if (codes.isEmpty() && !m.missingCodes().isEmpty()) {
            codes = m.missingCodes();
            taken.add(count(codes.size(), "missing code"));
        } else if (!codes.isEmpty() && !m.missingCodes().isEmpty()) {
            kept.add("missing codes from the YAML (the codebook's " + m.missingCodes().size() + " not used)");
        }
        var ranges = v.missingRanges();
        if (ranges.isEmpty() && !m.missingRanges().isEmpty()) {
            ranges = m.missingRanges();
            taken.add(count(ranges.size(), "missing range"));
        } else if (!ranges.isEmpty() && !m.missingRanges().isEmpty()) {
            kept.add("missing ranges from the YAML (the codebook's " + m.missingRanges().size() + " not used)");
        }
        String unit = v.unit();
        if (unit == null && m.unit() != null) {
            unit = m.unit();
            taken.add("unit " + m.unit());
        }
        RangeSpec range = v.range();
        if (range == null && m.validRange() != null && v.kind().isNumericScale()) {
            range = m.validRange();
            taken.add("valid range " + show(range));
        }
        KindFromCodebook k = kindOf(m);
        String kindNote = "kind " + v.kind().configName() + " from the YAML" + (k.kind() != null
                && k.kind() != v.kind() ? " (" + k.why().replace("codebook: ", "codebook says ") + ")" : "");
        StringBuilder line = new StringBuilder(v.name()).append(": ");
        if (!taken.isEmpty()) {
            line.append(join(taken)).append(" from the codebook; ");
        }
        kept.forEach(s -> line.append(s).append("; "));
        line.append(kindNote);
        report.add(line.toString());
        return new VariableConfig(v.name(), v.kind(), unit, range, codes, v.threshold(), v.successValue(),
                v.levels(), v.reference(), v.locationTest(), label, labels, ranges);
    }

    private static VariableConfig added(String column, VariableMeta m, List<String> report) {
        KindFromCodebook k = kindOf(m);
        VariableKind kind = k.kind();
        List<String> taken = new ArrayList<>();
        if (m.label() != null) {
            taken.add("label");
        }
        if (!m.valueLabels().isEmpty()) {
            taken.add(count(m.valueLabels().size(), "value label"));
        }
        if (!m.missingCodes().isEmpty()) {
            taken.add(count(m.missingCodes().size(), "missing code"));
        }
        if (!m.missingRanges().isEmpty()) {
            taken.add(count(m.missingRanges().size(), "missing range"));
        }
        if (m.unit() != null) {
            taken.add("unit " + m.unit());
        }
        RangeSpec range = null;
        if (m.validRange() != null && (kind == null || kind.isNumericScale())) {
            range = m.validRange();
            taken.add("valid range " + show(range));
        }
        List<String> levels = kind == VariableKind.ORDINAL && m.storage() == StorageType.TEXT
                ? List.copyOf(answerLabels(m).keySet()) : List.of();
        String renamed = column.equals(m.name()) ? "" : " (" + m.name() + " in the codebook)";
        report.add(column + renamed + ": only in the codebook; " + (taken.isEmpty() ? "" : join(taken)
                + " from the codebook; ") + (kind == null ? "kind left to inference from the data (" + k.why() + ")"
                : "kind " + kind.configName() + " (" + k.why() + ")"));
        return new VariableConfig(column, kind, m.unit(), range, m.missingCodes(), null, null, levels, null, null,
                m.label(), m.valueLabels(), m.missingRanges());
    }

    private static String count(int n, String what) {
        return n + " " + what + (n == 1 ? "" : "s");
    }

    private static String join(List<String> parts) {
        if (parts.size() == 1) {
            return parts.get(0);
        }
        return String.join(", ", parts.subList(0, parts.size() - 1)) + " and " + parts.get(parts.size() - 1);
    }

    private static String show(RangeSpec r) {
        return (r.min() == null ? "" : Codes.of(r.min())) + ".." + (r.max() == null ? "" : Codes.of(r.max()));
    }

}
