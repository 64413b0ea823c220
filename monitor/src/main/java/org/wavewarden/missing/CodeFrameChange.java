package org.wavewarden.missing;

import java.util.ArrayList;
import java.util.List;
import org.wavewarden.profile.CategoryCounts;

/**
 * Codes that appeared or vanished between two waves of a categorical variable: a changed code frame, as when a new
 * answer option is added to a questionnaire or a missing code is renamed.
 *
 * <p>A code counts as present in a wave when it has at least {@code minCount} answers, so one stray keying error
 * ("Noth" for "North") does not make a code appear, and a code with a handful of answers left does not count as
 * still in use. With {@code minCount = 1} every answer counts. Codes are listed in the order of the wave they are
 * present in.
 *
 * @param appeared codes present in the current wave but not in the baseline
 * @param vanished codes present in the baseline but not in the current wave
 * @param minCount the presence threshold used
 */
public record CodeFrameChange(List<String> appeared, List<String> vanished, long minCount) {

    public CodeFrameChange {
        appeared = List.copyOf(appeared);
        vanished = List.copyOf(vanished);
    }

    public static CodeFrameChange between(CategoryCounts baseline, CategoryCounts current, long minCount) {
        if (baseline == null) {
            throw new IllegalArgumentException("baseline must not be null");
        }
        if (current == null) {
            throw new IllegalArgumentException("current must not be null");
        }
        if (minCount < 1) {
            throw new IllegalArgumentException("minCount must be at least 1, was " + minCount);
        }
        List<String> appeared = new ArrayList<>();
        for (String c : current.categories()) {
            if (current.count(c) >= minCount && baseline.count(c) < minCount) {
                appeared.add(c);
            }
        }
        List<String> vanished = new ArrayList<>();
        for (String c : baseline.categories()) {
            if (baseline.count(c) >= minCount && current.count(c) < minCount) {
                vanished.add(c);
            }
        }
        return new CodeFrameChange(appeared, vanished, minCount);
    }

    /**
     * The codes with at least {@code minCount} answers in either wave, the baseline's first: the code frame the two
     * waves use together.
     */
    public static List<String> codesInUse(CategoryCounts baseline, CategoryCounts current, long minCount) {
        java.util.LinkedHashSet<String> codes = new java.util.LinkedHashSet<>();
        baseline.categories().stream().filter(c -> baseline.count(c) >= minCount).forEach(codes::add);
        current.categories().stream().filter(c -> current.count(c) >= minCount).forEach(codes::add);
        return List.copyOf(codes);
    }

    /**
     * True when two waves of a binary variable use more than two codes between them: its codes were renamed
     * (1/2 became yes/no) or a third was added. One code vanishing while the other stays is not a new frame but a
     * share of 0% or 100%, and stays a change of the share.
     */
    public static boolean outgrowsTwoCodes(CategoryCounts baseline, CategoryCounts current, long minCount) {
        return codesInUse(baseline, current, minCount).size() > 2;
    }

    public boolean changed() {
        return !appeared.isEmpty() || !vanished.isEmpty();
    }
}
