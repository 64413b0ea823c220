package org.wavewarden.deliver.sink;

import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;

import java.util.Arrays;
import java.util.Collection;
import java.util.Collections;
import java.util.EnumSet;
import java.util.Locale;
import java.util.Objects;
import java.util.Set;
import java.util.stream.Collectors;

/**
 * Which alerts one sink receives, so that, say, a pager hears only of MATERIAL shifts while a log file keeps
 * everything.
 *
 * <p>An alert with a verdict (SHIFT, PANEL_SHIFT, MISSING_RATE_CHANGE) passes when its verdict is at least as urgent as
 * {@code minimumVerdict} in the order of {@link Verdict} (MATERIAL, MINOR, UNCERTAIN, STABLE); a null minimum lets
 * every verdict through. An alert without a verdict passes when its kind is in {@code kinds}; an empty set stands
 * for every data-quality kind ({@link FindingKind#isDataQuality()}), so SHAPE_CHANGE and SKIPPED pass only when
 * listed by name.
 *
 * <p>An alert is one event with one or more findings ({@link AlertMessage#facets()}): it passes when any of them
 * passes, so a sink that takes a kind or a verdict hears of every event that shows it, with the event's other
 * findings beside it.
 *
 * @param minimumVerdict the least urgent verdict delivered, or null for all
 * @param kinds          the kinds without a verdict that are delivered; empty for every data-quality kind
 */
public record SinkFilter(Verdict minimumVerdict, Set<FindingKind> kinds) {

    public SinkFilter {
        Objects.requireNonNull(kinds, "kinds");
        kinds = kinds.isEmpty() ? Set.of() : Collections.unmodifiableSet(EnumSet.copyOf(kinds));
    }

    /** Every verdict and every data-quality kind. */
    public static SinkFilter all() {
        return new SinkFilter(null, Set.of());
    }

    /**
     * A filter from configuration text: a verdict name (any case, or null) and kind names (any case).
     *
     * @throws IllegalArgumentException naming the argument and the bad value, with the accepted values
     */
    public static SinkFilter of(String minimumVerdict, Collection<String> kinds) {
        Verdict v = null;
        if (minimumVerdict != null) {
            v = parse(Verdict.class, minimumVerdict, "minimumVerdict");
        }
        Set<FindingKind> k = EnumSet.noneOf(FindingKind.class);
        if (kinds != null) {
            for (String name : kinds) {
                k.add(parse(FindingKind.class, name, "kinds"));
            }
        }
        return new SinkFilter(v, k);
    }

    public boolean accepts(AlertMessage message) {
        return message.facets().stream().anyMatch(p -> accepts(p.kind(), p.verdict()));
    }

    /** A finding's kind and its verdict (null when it has none), as the filter decides on them. */
    public record Judged(FindingKind kind, Verdict verdict) {
    }

    /** Whether an alert with these findings passes: when any of them does. */
    public boolean acceptsAny(Collection<Judged> findings) {
        return findings.stream().anyMatch(j -> accepts(j.kind(), j.verdict()));
    }

    /** The rule above on a kind and its verdict (null when the finding has none). */
    public boolean accepts(FindingKind kind, Verdict verdict) {
        Objects.requireNonNull(kind, "kind");
        if (verdict != null) {
            return minimumVerdict == null || verdict.atLeast(minimumVerdict);
        }
        return kinds.isEmpty() ? kind.isDataQuality() : kinds.contains(kind);
    }

    private static <E extends Enum<E>> E parse(Class<E> type, String text, String argument) {
        String wanted = text == null ? "" : text.strip().toUpperCase(Locale.ROOT).replace('-', '_');
        for (E e : type.getEnumConstants()) {
            if (e.name().equals(wanted)) {
                return e;
            }
        }
        throw new IllegalArgumentException(argument + ": expected one of "
                + Arrays.stream(type.getEnumConstants()).map(Enum::name).collect(Collectors.joining(", "))
                + " but got '" + text + "'");
    }
}
