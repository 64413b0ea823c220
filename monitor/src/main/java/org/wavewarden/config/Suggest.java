package org.wavewarden.config;

import java.util.Collection;
import java.util.Locale;
import java.util.Optional;

/** Finds the known key closest to a misspelt one, for "did you mean" hints. */
public final class Suggest {

    private Suggest() {
    }

    public static Optional<String> nearest(String typed, Collection<String> known) {
        String best = null;
        int bestDistance = Integer.MAX_VALUE;
        for (String k : known) {
            int d = distance(typed.toLowerCase(Locale.ROOT), k.toLowerCase(Locale.ROOT));
            if (d < bestDistance) {
                bestDistance = d;
                best = k;
            }
        }
        // Beyond a third of the word's length the "suggestion" is more confusing than helpful.
        return best != null && bestDistance <= Math.max(2, typed.length() / 3) ? Optional.of(best) : Optional.empty();
    }

    /** Levenshtein distance. */
    static int distance(String a, String b) {
        int[] prev = new int[b.length() + 1];
        int[] cur = new int[b.length() + 1];
        for (int j = 0; j <= b.length(); j++) {
            prev[j] = j;
        }
        for (int i = 1; i <= a.length(); i++) {
            cur[0] = i;
            for (int j = 1; j <= b.length(); j++) {
                int sub = prev[j - 1] + (a.charAt(i - 1) == b.charAt(j - 1) ? 0 : 1);
                cur[j] = Math.min(sub, Math.min(prev[j] + 1, cur[j - 1] + 1));
            }
            int[] t = prev;
            prev = cur;
            cur = t;
        }
        return prev[b.length()];
    }
}
