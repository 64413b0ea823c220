package org.wavewarden.deliver;

import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;

import java.util.List;

/**
 * Which findings become alerts: shifts judged MATERIAL or UNCERTAIN, and data-quality findings. MINOR and STABLE
 * verdicts stay in the findings (a reader can audit them) but do not ask for anyone's time.
 */
public final class Alerts {

    private Alerts() {
    }

    public static boolean worthAPerson(Finding f) {
        if (f.kind() == FindingKind.SKIPPED) {
            return false;
        }
        if (f.verdict() != null) {
            return f.verdict() == Verdict.MATERIAL || f.verdict() == Verdict.UNCERTAIN;
        }
        return f.kind().isDataQuality() && f.kind() != FindingKind.MISSING_CODE;
    }

    public static List<Finding> select(List<Finding> findings) {
        return FindingsFiles.ordered(findings).stream().filter(Alerts::worthAPerson).toList();
    }
}
