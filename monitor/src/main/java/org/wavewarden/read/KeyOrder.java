package org.wavewarden.read;

import java.math.BigDecimal;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.PriorityQueue;
import java.util.function.Function;

/**
 * The order of respondent keys in reports: numerically when both keys are plain numbers (so respondent 9 comes
 * before respondent 10, as a reader expects of an integer key), else as text, numbers before text. Reports pick
 * their examples as the smallest keys in this order, so the same data always show the same examples whatever
 * order the database streamed them in.
 */
public final class KeyOrder {

    public static final Comparator<String> ORDER = KeyOrder::compare;

    private KeyOrder() {
    }

    public static int compare(String a, String b) {
        boolean na = isNumber(a);
        boolean nb = isNumber(b);
        if (na && nb) {
            int c = new BigDecimal(a).compareTo(new BigDecimal(b));
            return c != 0 ? c : a.compareTo(b); // 1 and 1.0 are different keys: keep the order total
        }
        if (na != nb) {
            return na ? -1 : 1;
        }
        return a.compareTo(b);
    }

    /** {@code -?digits[.digits]}: the numbers keys are written as (no exponents, which no key carries). */
    static boolean isNumber(String s) {
        int i = s.startsWith("-") ? 1 : 0;
        int digits = 0;
        boolean point = false;
        for (; i < s.length(); i++) {
            char c = s.charAt(i);
            if (c >= '0' && c <= '9') {
                digits++;
            } else if (c == '.' && !point && digits > 0) {
                point = true;
            } else {
                return false;
            }
        }
        return digits > 0 && !s.endsWith(".");
    }

    /** Keeps the {@code n} items with the smallest keys seen so far; memory stays at {@code n} items. */
    public static final class Smallest<T> {

        private final int n;
        private final Comparator<T> order;
        private final PriorityQueue<T> largestFirst;

        public Smallest(int n, Function<T, String> key) {
            if (n < 1) {
                throw new IllegalArgumentException("n must be positive, was " + n);
            }
            this.n = n;
            this.order = Comparator.comparing(key, ORDER);
            this.largestFirst = new PriorityQueue<>(n + 1, order.reversed());
        }

        public void offer(T item) {
            if (largestFirst.size() < n) {
                largestFirst.add(item);
            } else if (order.compare(item, largestFirst.peek()) < 0) {
                largestFirst.poll();
                largestFirst.add(item);
            }
        }

        /** The kept items, smallest key first. */
        public List<T> sorted() {
            List<T> out = new ArrayList<>(largestFirst);
            out.sort(order);
            return List.copyOf(out);
        }
    }
}
