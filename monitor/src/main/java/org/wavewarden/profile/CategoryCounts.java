package org.wavewarden.profile;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/** The valid answers of one categorical or binary variable in one wave, each category with its count. */
public record CategoryCounts(List<String> categories, long[] counts) {

    public CategoryCounts {
        if (categories.size() != counts.length) {
            throw new IllegalArgumentException("categories has " + categories.size() + " entries but counts has "
                    + counts.length);
        }
        if (categories.stream().distinct().count() != categories.size()) {
            throw new IllegalArgumentException("categories must be distinct: " + categories);
        }
        categories = List.copyOf(categories);
        counts = counts.clone();
        for (int i = 0; i < counts.length; i++) {
            if (counts[i] < 0) {
                throw new IllegalArgumentException("counts[" + i + "] must not be negative, was " + counts[i]);
            }
        }
    }

    public static CategoryCounts ofTally(Map<String, Long> tally) {
        List<String> cats = new ArrayList<>(tally.keySet());
        long[] c = new long[cats.size()];
        for (int i = 0; i < c.length; i++) {
            c[i] = tally.get(cats.get(i));
        }
        return new CategoryCounts(cats, c);
    }

    public long n() {
        return Arrays.stream(counts).sum();
    }

    public int size() {
        return counts.length;
    }

    public long count(String category) {
        int i = categories.indexOf(category);
        return i < 0 ? 0 : counts[i];
    }

    /** This table's counts laid out along the given category order, zero where a category is absent here. */
    public long[] alignedTo(List<String> order) {
        long[] out = new long[order.size()];
        for (int i = 0; i < out.length; i++) {
            out[i] = count(order.get(i));
        }
        return out;
    }

    /** The union of both tables' categories, this table's first, in first-seen order. */
    public List<String> unionOrder(CategoryCounts other) {
        Map<String, Boolean> seen = new LinkedHashMap<>();
        categories.forEach(c -> seen.put(c, true));
        other.categories.forEach(c -> seen.put(c, true));
        return List.copyOf(seen.keySet());
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof CategoryCounts c && categories.equals(c.categories) && Arrays.equals(counts, c.counts);
    }

    @Override
    public int hashCode() {
        return 31 * categories.hashCode() + Arrays.hashCode(counts);
    }
}
