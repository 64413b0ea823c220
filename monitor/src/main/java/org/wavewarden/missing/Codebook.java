package org.wavewarden.missing;

import java.math.BigDecimal;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;

/**
 * The missing codes of one variable, from its codebook: values that mean "refused", "don't know", "not
 * applicable" and so on, each with the reason it stands for.
 *
 * <p>Matching is lenient where the text form is not the meaning: in a numeric column the code {@code 999} matches
 * {@code 999}, {@code 999.0} and {@code 999.00} (numeric equality); a text code matches exactly and also after
 * trimming white space on both sides, so the code {@code ""} also catches {@code "   "}. Numeric equality is not
 * applied to text columns, where leading zeros and decimals are part of the answer ({@code "007"} is not {@code 7}).
 * Code values are common practice in survey codebooks (7/77/777 refused, 9/99/999 don't know); there is no single
 * published source for them.
 *
 * <p>Ranges ({@link MissingRange}, an SPSS user-missing range or a DDI invalid range) are matched in numeric columns
 * only, after the discrete codes: a value that is both a code and in a range is counted once, under the code's
 * reason.
 */
public record Codebook(List<MissingCode> codes, List<MissingRange> ranges) {

    /** Discrete codes only. */
    public Codebook(List<MissingCode> codes) {
        this(codes, List.of());
    }

    public Codebook {
        codes = List.copyOf(codes);
        ranges = ranges == null ? List.of() : List.copyOf(ranges);
        Map<String, String> seenText = new HashMap<>();
        Map<BigDecimal, String> seenNumber = new HashMap<>();
        for (MissingCode c : codes) {
            String key = c.value().strip();
            String before = seenText.putIfAbsent(key, c.value());
            if (before != null) {
                throw new IllegalArgumentException("codes lists '" + c.value() + "' twice (as '" + before + "')");
            }
            BigDecimal number = NumberText.parse(c.value());
            if (number != null) {
                String same = seenNumber.putIfAbsent(number.stripTrailingZeros(), c.value());
                if (same != null) {
                    throw new IllegalArgumentException("codes lists the number " + c.value() + " twice (as '" + same
                            + "')");
                }
            }
        }
    }

    public static Codebook empty() {
        return new Codebook(List.of());
    }

    public static Codebook of(MissingCode... codes) {
        return new Codebook(List.of(codes));
    }

    /** The reason for a raw value, matching numbers numerically (as in a numeric column); see the class comment. */
    public Optional<String> reasonOf(String rawValue) {
        return reasonOf(rawValue, ColumnType.DECIMAL);
    }

    /** The reason for a raw value of a column of the given type, or empty when the value is not a missing code. */
    public Optional<String> reasonOf(String rawValue, ColumnType type) {
        if (rawValue == null) {
            throw new IllegalArgumentException("rawValue must not be null (SQL NULL is counted apart)");
        }
        for (MissingCode c : codes) {
            if (c.value().equals(rawValue)) {
                return Optional.of(c.reason());
            }
        }
        String trimmed = rawValue.strip();
        for (MissingCode c : codes) {
            if (c.value().strip().equals(trimmed)) {
                return Optional.of(c.reason());
            }
        }
        if (type.isNumeric()) {
            BigDecimal raw = NumberText.parse(rawValue);
            if (raw != null) {
                for (MissingCode c : codes) {
                    BigDecimal code = NumberText.parse(c.value());
                    if (code != null && code.compareTo(raw) == 0) {
                        return Optional.of(c.reason());
                    }
                }
                for (MissingRange r : ranges) {
                    if (r.contains(raw)) {
                        return Optional.of(r.reason());
                    }
                }
            }
        }
        return Optional.empty();
    }

    /** The distinct reasons in codebook order: the codes' first, then the ranges'. */
    public List<String> reasons() {
        List<String> out = new ArrayList<>();
        for (MissingCode c : codes) {
            if (!out.contains(c.reason())) {
                out.add(c.reason());
            }
        }
        for (MissingRange r : ranges) {
            if (!out.contains(r.reason())) {
                out.add(r.reason());
            }
        }
        return List.copyOf(out);
    }

    /**
     * Separates the coded missing rows from the valid ones, so that no later comparison can count a missing code as
     * an answer.
     */
    public CodebookSplit split(ColumnTally tally) {
        if (tally == null) {
            throw new IllegalArgumentException("tally must not be null");
        }
        Map<String, Long> byReason = new LinkedHashMap<>();
        for (String r : reasons()) {
            byReason.put(r, 0L);
        }
        Map<String, Long> valid = new LinkedHashMap<>();
        long coded = 0;
        for (Map.Entry<String, Long> e : tally.valueCounts().entrySet()) {
            Optional<String> reason = reasonOf(e.getKey(), tally.type());
            if (reason.isPresent()) {
                byReason.merge(reason.get(), e.getValue(), Long::sum);
                coded += e.getValue();
            } else {
                valid.put(e.getKey(), e.getValue());
            }
        }
        ColumnTally validOnly = new ColumnTally(tally.column(), tally.type(), tally.rowCount() - coded,
                tally.nullCount(), valid, tally.truncated());
        return new CodebookSplit(byReason, validOnly);
    }
}
