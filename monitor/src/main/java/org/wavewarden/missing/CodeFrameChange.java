package org.wavewarden.missing;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.wavewarden.codebook.CodeLabels;
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

    /**
     * The codes answered at least {@code minCount} times that have no value label, in the order of {@code answers},
     * when the variable has value labels at all: a code outside the codebook's frame. A variable without labels has
     * no frame to be outside of, and gives none.
     *
     * @param answers each answered code with its count, codes in the text form the wave's tally holds
     */
    public static List<String> unlabelled(Map<String, Long> answers, CodeLabels labels, long minCount) {
        if (!labels.hasValueLabels()) {
            return List.of();
        }
        return answers.entrySet().stream().filter(e -> e.getValue() >= minCount && labels.label(e.getKey()) == null)
                .map(Map.Entry::getKey).toList();
    }

    /**
     * One code whose label differs between two waves' codebooks.
     *
     * @param code     the code as the current wave's codebook writes it
     * @param before   its label in the baseline wave's codebook
     * @param after    its label in the current wave's codebook
     */
    public record Relabel(String code, String before, String after) {
    }

    /**
     * The codes labelled in both codebooks whose labels differ, in the current codebook's order: the same code now
     * means something else, so its shares are not comparable as they stand. A code labelled in one codebook only is
     * no relabelling (it is a code added to or dropped from the frame, which the answers show as appeared or
     * vanished). Labels are compared as written: a changed spelling counts, since only a person can tell a typo fixed
     * from a meaning changed.
     */
    public static List<Relabel> relabelled(CodeLabels baseline, Map<String, String> current) {
        List<Relabel> out = new ArrayList<>();
        current.forEach((code, after) -> {
            String before = baseline.label(code);
            if (before != null && after != null && !before.equals(after)) {
                out.add(new Relabel(code, before, after));
            }
        });
        return out;
    }
}
