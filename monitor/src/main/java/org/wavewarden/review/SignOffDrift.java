package org.wavewarden.review;

import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.pipeline.WaveJudge;

import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;

/**
 * A rerun of a signed-off wave that changes its findings: the release was signed on other numbers, which the new
 * run says loudly with a SIGNED_WAVE_CHANGED finding.
 */
public final class SignOffDrift {

    /**
     * How far two numbers of a finding may differ and still be the same number: rounding noise of a recomputation
     * on the same data (summation order), far below any printed digit. Common practice, no source.
     */
    static final double RELATIVE_TOLERANCE = 1e-12;

    /** How many changes the sentence lists; the detail lists them all. */
    static final int LISTED = 3;

    private SignOffDrift() {
    }

    /**
     * One finding that changed between the signed run and the new one.
     *
     * @param before the signed run's verdict ({@code present} for a data-quality finding without one), or
     *               {@code (none)} when the signed run did not have the finding
     * @param after  the same for the new run
     * @param what   what changed: {@code added}, {@code gone}, {@code verdict} or {@code numbers}
     */
    public record Change(String variable, String kind, String before, String after, String what) {
        String words() {
            return variable + " " + kind + " " + before + " -> " + after
                    + (what.equals("numbers") ? " (numbers changed)" : "");
        }
    }

    /**
     * @param signed         the wave's latest sign-off
     * @param signedFindings the findings of the run it was signed on
     * @param newFindings    the findings of the run being written
     * @return the finding to add when they differ
     */
    public static Optional<Finding> check(SignOff signed, List<Finding> signedFindings, List<Finding> newFindings) {
        List<Change> changes = changes(signedFindings, newFindings);
        if (changes.isEmpty()) {
            return Optional.empty();
        }
        List<String> listed = changes.stream().limit(LISTED).map(Change::words).toList();
        String sentence = "Wave " + signed.wave() + " was signed off by " + signed.actor() + " on "
                + signed.signedAt().atOffset(ZoneOffset.UTC).toLocalDate() + " on other numbers: " + changes.size()
                + (changes.size() == 1 ? " finding" : " findings") + " changed (" + String.join("; ", listed)
                + (changes.size() > LISTED ? "; and " + (changes.size() - LISTED) + " more" : "")
                + "). The release rests on findings that no longer hold.";
        Map<String, Object> detail = new LinkedHashMap<>();
        detail.put("signOffId", signed.signOffId());
        detail.put("signedRunId", signed.runId());
        detail.put("signedBy", signed.actor());
        detail.put("signedAt", signed.signedAt().toString());
        detail.put("release", signed.release());
        detail.put("changes", changes);
        return Optional.of(Finding.dataQuality(WaveJudge.EMPTY_WAVE_SUBJECT, FindingKind.SIGNED_WAVE_CHANGED, null, null, sentence,
                detail));
    }

    /**
     * What a reader acts on that differs: a finding added or gone (by variable and kind), another verdict, or an
     * effect estimate, p- or q-value that moved beyond rounding. Earlier SIGNED_WAVE_CHANGED findings are not
     * compared (they are about the sign-off, not the data); the order is the signed run's, then the additions.
     */
    public static List<Change> changes(List<Finding> signedFindings, List<Finding> newFindings) {
        Map<String, Finding> before = byKey(signedFindings);
        Map<String, Finding> after = byKey(newFindings);
        List<Change> out = new ArrayList<>();
        before.forEach((key, b) -> {
            Finding a = after.get(key);
            if (a == null) {
                out.add(new Change(b.variable(), b.kind().name(), verdict(b), "(none)", "gone"));
            } else if (b.verdict() != a.verdict()) {
                out.add(new Change(b.variable(), b.kind().name(), verdict(b), verdict(a), "verdict"));
            } else if (moved(estimate(b), estimate(a)) || moved(b.pValue(), a.pValue())
                    || moved(b.qValue(), a.qValue())) {
                out.add(new Change(b.variable(), b.kind().name(), verdict(b), verdict(a), "numbers"));
            }
        });
        after.forEach((key, a) -> {
            if (!before.containsKey(key)) {
                out.add(new Change(a.variable(), a.kind().name(), "(none)", verdict(a), "added"));
            }
        });
        return out;
    }

    private static Map<String, Finding> byKey(List<Finding> findings) {
        Map<String, Finding> m = new LinkedHashMap<>();
        for (Finding f : findings) {
            if (f.kind() != FindingKind.SIGNED_WAVE_CHANGED) {
                m.putIfAbsent(f.variable() + "\u0000" + f.kind().name(), f);
            }
        }
        return m;
    }

    private static String verdict(Finding f) {
        return f.verdict() == null ? "present" : f.verdict().name();
    }

    private static Double estimate(Finding f) {
        return f.effect() == null ? null : f.effect().estimate();
    }

    static boolean moved(Double before, Double after) {
        if (before == null || after == null) {
            return !Objects.equals(before, after);
        }
        if (before.isNaN() || after.isNaN()) {
            return before.isNaN() != after.isNaN();
        }
        double scale = Math.max(Math.abs(before), Math.abs(after));
        return Math.abs(before - after) > RELATIVE_TOLERANCE * scale;
    }
}
