package org.wavewarden.bench;

import java.io.PrintWriter;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * The figures of one bench run, as written to the JSON file: the setup, every measurement with its repetitions
 * and median, the ratios of a check to the database floor, and the statements a check sent to the source.
 */
public record BenchReport(Instant generatedAt, Setup setup, List<Measurement> measurements, Ratios ratios,
                          Map<String, StatementCounter.SourceStatements> sourceStatementsPerCheck) {

    /** What was measured on what. */
    public record Setup(long rowsPerWave, int variables, int repeat, int historyWaves, long historyRowsPerWave,
                        String server, String serverVersion, String javaVersion, int processors, long maxHeapBytes,
                        double generateSeconds) {
    }

    /** One figure: every repetition's seconds, their median, and the largest heap figures of any repetition. */
    public record Measurement(String name, List<Double> seconds, double medianSeconds, long peakHeapUsedBytes,
                              long peakLiveHeapAfterGcBytes) {

        static Measurement of(String name, List<Double> seconds, long peakUsed, long peakLive) {
            return new Measurement(name, List.copyOf(seconds), median(seconds), peakUsed, peakLive);
        }
    }

    /**
     * Median check time over the median floor times, a check with 30 earlier waves over one with 2, and the scan
     * with breakdowns over the floors and over the plain scan, and the check with breakdowns over the binary COPY and
     * over the check without them (NaN without the breakdown case).
     */
    public record Ratios(double checkOverCountScan, double checkOverBinaryCopy, double historyOverTwoWaves,
                         double breakdownsOverCountScan, double breakdownsOverBinaryCopy,
                         double breakdownsOverPlainScan, double checkWithBreakdownsOverBinaryCopy,
                         double checkWithBreakdownsOverCheck) {

        static Ratios of(List<Measurement> ms) {
            double b = median(ms, "b_check");
            double d = median(ms, "d_scan_breakdowns");
            double e = median(ms, "e_check_breakdowns");
            double a2 = median(ms, "a2_binary_copy");
            return new Ratios(b / median(ms, "a1_count_scan"), b / a2, median(ms, "c_check_history") / b,
                    d / median(ms, "a1_count_scan"), d / a2, d / median(ms, "scan_only"), e / a2, e / b);
        }
    }

    static double median(List<Double> xs) {
        List<Double> s = new ArrayList<>(xs);
        s.sort(null);
        int n = s.size();
        return n == 0 ? Double.NaN : n % 2 == 1 ? s.get(n / 2) : (s.get(n / 2 - 1) + s.get(n / 2)) / 2;
    }

    private static double median(List<Measurement> ms, String name) {
        return ms.stream().filter(m -> m.name().equals(name)).mapToDouble(Measurement::medianSeconds).findFirst()
                .orElse(Double.NaN);
    }

    /** A plain table for the console. */
    static void print(BenchReport r, PrintWriter out) {
        Setup s = r.setup();
        out.printf(Locale.ROOT, "%n%,d rows per wave, %d variables, %d repetitions, PostgreSQL %s, Java %s, %d cores,"
                        + " max heap %,d MB%n", s.rowsPerWave(), s.variables(), s.repeat(), s.serverVersion(),
                s.javaVersion(), s.processors(), s.maxHeapBytes() >> 20);
        out.printf(Locale.ROOT, "%-26s %10s %10s %10s %14s %14s%n", "measurement", "median s", "min s", "max s",
                "peak heap MB", "live@GC MB");
        for (Measurement m : r.measurements()) {
            out.printf(Locale.ROOT, "%-26s %10.3f %10.3f %10.3f %14d %14d%n", m.name(), m.medianSeconds(),
                    m.seconds().stream().mapToDouble(Double::doubleValue).min().orElse(Double.NaN),
                    m.seconds().stream().mapToDouble(Double::doubleValue).max().orElse(Double.NaN),
                    m.peakHeapUsedBytes() >> 20, m.peakLiveHeapAfterGcBytes() >> 20);
        }
        Ratios q = r.ratios();
        out.printf(Locale.ROOT, "check / count scan (b/a1) %.2f; check / binary COPY (b/a2) %.2f; check with %d earlier"
                + " waves / with 2 (c) %.2f%n", q.checkOverCountScan(), q.checkOverBinaryCopy(), s.historyWaves() + 2,
                q.historyOverTwoWaves());
        if (!Double.isNaN(q.breakdownsOverCountScan())) {
            out.printf(Locale.ROOT, "scan with breakdowns / count scan (d/a1) %.2f; / binary COPY (d/a2) %.2f;"
                    + " / scan without them %.2f%n", q.breakdownsOverCountScan(), q.breakdownsOverBinaryCopy(),
                    q.breakdownsOverPlainScan());
            out.printf(Locale.ROOT, "check with breakdowns / binary COPY (e/a2) %.2f; / check without them (e/b) %.2f%n",
                    q.checkWithBreakdownsOverBinaryCopy(), q.checkWithBreakdownsOverCheck());
        }
        r.sourceStatementsPerCheck().forEach((k, v) -> out.printf(Locale.ROOT,
                "%-26s source statements %d (table queries %d, catalog queries %d, COPY %d, other raw %d): %d scans%n",
                k, v.total(), v.tableQueries(), v.catalogQueries(), v.copies(), v.rawStatements() - v.copies(),
                v.scans()));
    }
}
