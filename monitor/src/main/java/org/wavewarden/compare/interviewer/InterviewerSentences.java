package org.wavewarden.compare.interviewer;

import org.wavewarden.compare.domain.DomainMeasure;

import java.util.List;
import java.util.Locale;

/** The plain sentences of the interviewer findings: what the interviewer did, against the others, and how sure. */
final class InterviewerSentences {

    private InterviewerSentences() {
    }

    /**
     * "Interviewer H17 keyed 999 for 118 of 131 interviews on height_cm (90%; other interviewers 0.1%), q < 0.001;
     * 24 interviewers judged, 3 under the minimum workload of 20. A screening aid: ..."
     */
    static String outlier(InterviewerFlag f, InterviewerMonitor.Test t, InterviewerMonitor.Workloads w) {
        String who = "Interviewer " + f.interviewer();
        String what = switch (f.measure()) {
            case "mean" -> String.format(Locale.ROOT, "%s's mean %s is %s over %,d valid answers (other "
                    + "interviewers %s)", who, f.variable(), mean(f.value()), t.ownN(), mean(f.rest()));
            case "answer shares" -> String.format(Locale.ROOT, "%s's answers to %s are spread differently from "
                            + "the other interviewers' (%s: %s of %,d valid answers; other interviewers %s)", who,
                    f.variable(), t.shown(), pct(t.shownShare()), t.ownN(), pct(t.shownRest()));
            default -> String.format(Locale.ROOT, "%s %s for %,d of %,d %s (%s; other interviewers %s)", who,
                    keyed(f.offendingValues(), f.measure()), t.hits(), t.ownN(),
                    t.ofRows() ? "interviews on " + f.variable() : "valid answers to " + f.variable(),
                    pct(f.value()), pct(f.rest()));
        };
        return what + ", " + q(f.qValue()) + "; " + workloads(w)
                + " A screening aid: worth a look at these interviews, not proof of a fault.";
    }

    /**
     * "Answers to height_cm cluster by interviewer: intra-interviewer correlation 0.12 (95% interval 0.06 to 0.21),
     * above 0.02; 24 interviewers judged, ..."
     */
    static String effect(InterviewerEffect e, double threshold, double confidence, InterviewerMonitor.Workloads w) {
        String of = switch (e.measure()) {
            case "missing" -> "Whether " + e.variable() + " is missing clusters by interviewer";
            case "value" -> "Answers to " + e.variable() + " cluster by interviewer";
            default -> "The " + e.measure() + " of " + e.variable() + " clusters by interviewer";
        };
        return String.format(Locale.ROOT, "%s: intra-interviewer correlation %.3f (%s interval %.3f to %.3f), "
                        + "above %s; with %.1f interviews per interviewer in effect, the variance of a mean is about %.2f "
                        + "times that of a simple random sample (1 + (m0 - 1) rho, Kish 1962); %s", of, e.icc(),
                pctLevel(confidence), e.ciLow(), e.ciHigh(), trim(threshold), e.m0(),
                1 + (e.m0() - 1) * e.icc(), workloads(w));
    }

    private static String keyed(List<String> values, String measure) {
        if (measure.equals("missing share")) {
            if (values.size() == 1 && values.get(0).equals(DomainMeasure.NULL)) {
                return "left no answer";
            }
            return "recorded a missing answer (" + String.join(", ", values.stream().map(InterviewerSentences::shown)
                    .toList()) + ")";
        }
        return values.size() == 1 && values.get(0).equals(DomainMeasure.NULL) ? "left no answer"
                : "recorded " + shown(values.get(0));
    }

    private static String shown(String value) {
        return value.equals(DomainMeasure.NULL) ? "SQL NULL" : value;
    }

    private static String workloads(InterviewerMonitor.Workloads w) {
        return String.format(Locale.ROOT, "%d interviewer%s judged, %d under the minimum workload of %d.", w.judged(),
                w.judged() == 1 ? "" : "s", w.under(), w.minimum());
    }

    /** A proportion as a percentage with the digits that keep small shares apart: 90%, 4.2%, 0.13%. */
    static String pct(double x) {
        double v = 100 * x;
        if (v == 0 || v == 100) {
            return String.format(Locale.ROOT, "%.0f%%", v);
        }
        return v >= 10 ? String.format(Locale.ROOT, "%.0f%%", v) : v >= 1 ? String.format(Locale.ROOT, "%.1f%%", v)
                : String.format(Locale.ROOT, "%.2g%%", v);
    }

    private static String mean(double m) {
        double a = Math.abs(m);
        return String.format(Locale.ROOT, a >= 100 ? "%.1f" : a >= 1 ? "%.2f" : "%.3g", m);
    }

    static String q(double q) {
        return q < 0.001 ? "q < 0.001" : String.format(Locale.ROOT, "q = %.2g", q);
    }

    private static String pctLevel(double confidence) {
        return trim(100 * confidence) + "%";
    }

    private static String trim(double x) {
        return java.math.BigDecimal.valueOf(x).stripTrailingZeros().toPlainString();
    }
}
