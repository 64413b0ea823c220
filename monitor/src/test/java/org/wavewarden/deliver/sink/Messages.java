package org.wavewarden.deliver.sink;

import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;

import java.util.List;
import java.util.Map;

/** Findings and messages for the sink tests. */
final class Messages {

    private Messages() {
    }

    static Finding shift(String variable, Verdict verdict) {
        return new Finding(variable, FindingKind.SHIFT, "Mann-Whitney", 2.5, 0.012, 0.03,
                new Finding.Effect("cliffs_delta", 0.21, 0.08, 0.33, 0.147), verdict, 500L, 520L,
                "Scores on " + variable + " rose.", Map.of("note", "x"));
    }

    static Finding quality(String variable, FindingKind kind) {
        return Finding.dataQuality(variable, kind, 500L, 520L, "Odd values in " + variable + ".", Map.of());
    }

    static AlertMessage message(Finding f) {
        return AlertMessage.of("survey", "w2", "w1", 7L, "abc123", f);
    }

    static List<AlertMessage> batch() {
        return AlertMessage.ofRun("survey", "w2", "w1", 7L, "abc123", List.of(
                shift("age", Verdict.MATERIAL), shift("income", Verdict.UNCERTAIN),
                quality("region", FindingKind.PLACEHOLDER)));
    }
}
