package org.wavewarden.soak;

import java.io.PrintWriter;
import java.time.Instant;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * What a soak did and what its audit found; written as JSON and printed as a table.
 *
 * @param minutes        the fault phase's length as asked
 * @param waves          the judging half of the audit
 * @param alerts         current alerts in the results schema
 * @param sinks          the delivery half of the audit, per sink
 * @param faults         faults injected per kind
 * @param faultsInjected faults injected in all
 * @param daemonStarts   how often the daemon's JVM was started
 * @param daemonExits    exit codes of the times it exited by itself (it was started again)
 * @param caughtUp       whether, after the faults, every wave was judged and every alert delivered within the wait
 * @param catchUpSeconds how long the daemon was given after the faults
 * @param lost           alerts lost, over all sinks
 * @param duplicated     deliveries taken beyond the first, over all sinks (at the webhook: under another key)
 * @param repeats        requests answered 200 as repeats of a key the receiver had taken, over all sinks: retries
 *                       of a sender that missed the answer, recognised by key, not deliveries
 * @param unexpected     deliveries of no current alert, over all sinks
 * @param clean          every wave judged exactly once, nothing lost, duplicated or unexpected
 * @param files          every file the soak wrote, by what it holds
 */
public record SoakReport(Instant startedAt, Instant finishedAt, double minutes, long seed, String database,
                         String resultsSchema, String sourceTable, SoakAudit.Waves waves, int alerts,
                         List<SoakAudit.Sink> sinks, Map<String, Integer> faults, int faultsInjected, int daemonStarts,
                         List<Integer> daemonExits, boolean caughtUp, double catchUpSeconds, int lost, int duplicated,
                         int repeats, int unexpected, boolean clean, Map<String, String> files) {

    public void print(PrintWriter out) {
        out.println();
        out.println("soak audit");
        row(out, "minutes", fmt(minutes) + " (seed " + seed + ", " + database + " database)");
        row(out, "waves produced", Integer.toString(waves.produced()));
        row(out, "waves judged once", Integer.toString(waves.judged()));
        if (!waves.notJudged().isEmpty()) {
            row(out, "waves not judged", waves.notJudged().toString());
        }
        if (!waves.judgedMoreThanOnce().isEmpty()) {
            row(out, "waves judged twice", waves.judgedMoreThanOnce().toString());
        }
        if (!waves.judgedButNotProduced().isEmpty()) {
            row(out, "runs of unknown waves", waves.judgedButNotProduced().toString());
        }
        row(out, "runs", waves.runs() + " (" + waves.supersededRuns() + " superseded)");
        row(out, "alerts", Integer.toString(alerts));
        for (SoakAudit.Sink s : sinks) {
            row(out, "deliveries " + s.sink(), String.format(Locale.ROOT,
                    "%d of %d alerts; %d requests, %d accepted, %d keys, %d repeats recognised by key;"
                            + " lost %d, duplicated %d, unexpected %d",
                    s.delivered(), s.expected(), s.requests(), s.accepted(), s.keys(), s.repeats(), s.lost(),
                    s.duplicated(), s.unexpected()));
            s.lostAlerts().forEach(a -> row(out, "  lost", a));
            s.duplicatedAlerts().forEach(a -> row(out, "  duplicated", a));
            s.unexpectedDeliveries().forEach(a -> row(out, "  unexpected", a));
        }
        row(out, "faults injected", faultsInjected + " " + faults);
        row(out, "daemon starts", daemonStarts + (daemonExits.isEmpty() ? ""
                : " (exited by itself " + daemonExits.size() + " times, codes " + daemonExits + ")"));
        row(out, "catch-up", fmt(catchUpSeconds) + " s" + (caughtUp ? "" : " (ended with alerts still undelivered)"));
        row(out, "lost", Integer.toString(lost));
        row(out, "duplicated", Integer.toString(duplicated));
        row(out, "repeats recognised", repeats + " (by idempotency key; not deliveries)");
        row(out, "unexpected", Integer.toString(unexpected));
        row(out, "verdict", clean ? "clean" : "NOT CLEAN");
        out.flush();
    }

    private static void row(PrintWriter out, String name, String value) {
        out.printf(Locale.ROOT, "  %-22s %s%n", name, value);
    }

    private static String fmt(double x) {
        return String.format(Locale.ROOT, "%.1f", x);
    }
}
