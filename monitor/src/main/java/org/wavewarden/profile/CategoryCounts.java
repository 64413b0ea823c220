package org.wavewarden.profile;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * The valid answers of one categorical or binary variable in one wave, each category with its count. A category's
 * position is looked up by hash, so that work over a variable of a hundred thousand categories stays linear.
 */
public final class CategoryCounts {

    private final List<String> categories;
    private final long[] counts;
    private final Map<String, Integer> position;

    public CategoryCounts(List<String> categories, long[] counts) {
        if (categories.size() != counts.length) {
            throw new IllegalArgumentException("categories has " + categories.size() + " entries but counts has "
                    + counts.length);
        }
        this.categories = List.copyOf(categories);
        this.position = new HashMap<>(Math.max(16, categories.size() * 2));
        for (int i = 0; i < this.categories.size(); i++) {
            if (position.put(this.categories.get(i), i) != null) {
                throw new IllegalArgumentException("categories must be distinct, '" + this.categories.get(i)
                        + "' repeats");
            }
        }
        this.counts = counts.clone();
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

    public List<String> categories() {
        return categories;
    }

    /** The counts, in the order of {@link #categories()}; the array itself, as a record's accessor gives it. */
    public long[] counts() {
        return counts;
    }

    public long n() {
        return Arrays.stream(counts).sum();
    }

    public int size() {
        return counts.length;
    }

    public long count(String category) {
        Integer i = position.get(category);
        return i == null ? 0 : counts[i];
    }

    /** The position of a category in {@link #categories()}, or -1 when it has none here. */
    public int indexOf(String category) {
        Integer i = position.get(category);
        return i == null ? -1 : i;
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

    @Override
    public String toString() {
        return "CategoryCounts[categories=" + categories + ", counts=" + Arrays.toString(counts) + "]";
    }
}
