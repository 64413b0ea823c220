package org.wavewarden.bench;

import org.jdbi.v3.core.Jdbi;
import org.wavewarden.config.Identifiers;

/**
 * A long invented history in a results schema, for measuring the console's pages: datasets of the Harrowmere County
 * survey programme, each with waves of judged variables (one finding per variable and wave), alerts on about one
 * finding in twenty, their histories (opened, some explained or muted), one superseded earlier run of each dataset's
 * second wave, and sign-offs of every wave but the last two. Written by the server itself from generate_series, a
 * handful of statements whatever the size, so 600,000 findings take seconds rather than a million round trips.
 *
 * <p>The figures are invented, not simulated from a survey: verdicts come from a hash of the run and variable, so
 * the same arguments give the same history.
 */
public final class ConsoleHistory {

    /** What to generate. */
    public record Size(int datasets, int waves, int variables) {
        public Size {
            if (datasets < 1 || waves < 2 || variables < 1) {
                throw new IllegalArgumentException("a history needs at least 1 dataset, 2 waves and 1 variable, not "
                        + datasets + "/" + waves + "/" + variables);
            }
            // Names are numbered with fixed widths so that waves sort in their order as text.
            if (datasets > 99 || waves > 99 || variables > 999) {
                throw new IllegalArgumentException("a history has at most 99 datasets, 99 waves and 999 variables,"
                        + " not " + datasets + "/" + waves + "/" + variables);
            }
        }

        /** The findings of current runs: one per dataset, wave and variable. */
        public long currentFindings() {
            return (long) datasets * waves * variables;
        }
    }

    /** What was written. */
    public record Written(long runs, long findings, long alerts, long actions, long signOffs, long millis) {
    }

    private ConsoleHistory() {
    }

    /** The name of dataset {@code i} (from 1). */
    public static String dataset(int i) {
        return String.format("harrowmere_panel_%02d", i);
    }

    /** The name of wave {@code i} (from 1), in an order its name sorts in. */
    public static String wave(int i) {
        return String.format("w%02d", i);
    }

    /** The name of variable {@code i} (from 1). */
    public static String variable(int i) {
        return String.format("q%03d", i);
    }

    /** Writes the history into {@code schema}, which must be migrated and hold no runs. */
    public static Written write(Jdbi jdbi, String schema, Size size) {
        String s = Identifiers.quote(schema);
        long started = System.nanoTime();
        return jdbi.inTransaction(h -> {
            // Runs: every wave of every dataset, an hour apart; wave 2 of each dataset judged twice, the first run
            // superseded by the second (its findings and alerts stay, as a real rerun's do).
            h.createUpdate("INSERT INTO " + s + ".run (dataset, wave, against_wave, summary_checksum, started_at,"
                            + " finished_at, alpha, fdr_method, findings_count, alerts_count, tool_version,"
                            + " config_fingerprint, superseded_at)"
                            + " SELECT format('harrowmere_panel_%s', lpad(d::text, 2, '0')), format('w%s', lpad(w::text, 2, '0')),"
                            + " CASE WHEN w = 1 THEN '' ELSE format('w%s', lpad((w - 1)::text, 2, '0')) END,"
                            + " md5(d || '/' || w || '/' || rerun), t, t + interval '2 minutes', 0.05, 'BENJAMINI_HOCHBERG',"
                            + " :v, 0, 'history', 'history', CASE WHEN rerun = 0 AND w = 2 THEN t + interval '30 minutes' END"
                            + " FROM generate_series(1, :d) d, generate_series(1, :w) w, generate_series(0, 1) rerun,"
                            + " LATERAL (SELECT timestamptz '2024-01-01 00:00:00+00' + (w * 60 + d + rerun * 10)"
                            + " * interval '1 minute' AS t) x WHERE rerun = 1 OR w = 2 ORDER BY d, w, rerun")
                    .bind("d", size.datasets()).bind("w", size.waves()).bind("v", size.variables()).execute();
            // Findings: a change in the mean of each variable. Verdicts by a hash: about 3% MATERIAL, 2% UNCERTAIN,
            // 15% MINOR, the rest STABLE; every tenth variable a missing-rate change as well as a shift.
            h.createUpdate("INSERT INTO " + s + ".finding (run_id, variable, label, kind, test, statistic, p_value,"
                            + " q_value, effect_name, effect_estimate, effect_ci_low, effect_ci_high, effect_threshold,"
                            + " verdict, n_baseline, n_current, sentence, detail)"
                            + " SELECT r.run_id, format('q%s', lpad(v::text, 3, '0')), format('Harrowmere question %s', v),"
                            + " 'SHIFT', 'Welch t', g.e * 20, 0.5, 0.5, 'Hedges'' g', g.e, g.e - 0.04, g.e + 0.04, 0.1,"
                            + " CASE WHEN g.u < 3 THEN 'MATERIAL' WHEN g.u < 5 THEN 'UNCERTAIN' WHEN g.u < 20 THEN 'MINOR'"
                            + " ELSE 'STABLE' END, 1000, 1000,"
                            + " format('The mean of question %s moved by %s standard deviations.', v, round(g.e::numeric, 2)),"
                            + " jsonb_build_object('plot', jsonb_build_object('statistic', 'mean', 'estimator', 'MEAN',"
                            + " 'baseline', jsonb_build_array(jsonb_build_object('value', 50, 'low', 49, 'high', 51)),"
                            + " 'current', jsonb_build_array(jsonb_build_object('value', 50 + g.e * 10,"
                            + " 'low', 49 + g.e * 10, 'high', 51 + g.e * 10))))"
                            + " FROM " + s + ".run r, generate_series(1, :v) v,"
                            + " LATERAL (SELECT abs(hashtext(r.run_id || ':' || v)) % 100 AS u,"
                            + " ((abs(hashtext(v || ':' || r.run_id)) % 401) - 200) / 1000.0 AS e) g")
                    .bind("v", size.variables()).execute();
            h.createUpdate("INSERT INTO " + s + ".finding (run_id, variable, label, kind, test, p_value, q_value,"
                            + " effect_name, effect_estimate, effect_ci_low, effect_ci_high, effect_threshold, verdict,"
                            + " n_baseline, n_current, sentence)"
                            + " SELECT run_id, variable, label, 'MISSING_RATE_CHANGE', 'two-proportion z', 0.5, 0.5,"
                            + " 'risk difference (points)', 1, -1, 3, 5, 'STABLE', 1000, 1000,"
                            + " format('The share missing of %s stayed within 5 points.', variable)"
                            + " FROM " + s + ".finding WHERE kind = 'SHIFT' AND right(variable, 1) = '0'").execute();
            // Alerts on the MATERIAL and UNCERTAIN shifts, superseded with the run they belong to.
            h.createUpdate("INSERT INTO " + s + ".alert (run_id, dataset, wave, against_wave, variable, kind, verdict,"
                            + " sentence, created_at, superseded_at) SELECT r.run_id, r.dataset, r.wave, r.against_wave,"
                            + " f.variable, f.kind, f.verdict, f.sentence, r.finished_at, r.superseded_at FROM " + s
                            + ".finding f JOIN " + s + ".run r ON r.run_id = f.run_id"
                            + " WHERE f.verdict IN ('MATERIAL', 'UNCERTAIN') ORDER BY f.finding_id").execute();
            h.createUpdate("UPDATE " + s + ".run r SET alerts_count = (SELECT count(*) FROM " + s
                    + ".alert a WHERE a.run_id = r.run_id)").execute();
            // Histories: opened by the monitor; every seventh alert explained, every eleventh muted until the
            // dataset's last wave; the superseded run's alerts closed by the rerun.
            h.createUpdate("INSERT INTO " + s + ".alert_action (alert_id, acted_at, actor, action, source)"
                    + " SELECT alert_id, created_at, 'wavewarden', 'OPENED', 'run' FROM " + s + ".alert ORDER BY alert_id")
                    .execute();
            h.createUpdate("INSERT INTO " + s + ".alert_action (alert_id, acted_at, actor, action, reason, note, source,"
                            + " until_wave) SELECT alert_id, created_at + interval '1 day', 'Ines Calloway',"
                            + " CASE WHEN alert_id % 7 = 0 THEN 'EXPLAINED' ELSE 'MUTED' END,"
                            + " CASE WHEN alert_id % 7 = 0 THEN 'planned-change' ELSE 'fix-upstream' END,"
                            + " 'Reviewed with the Harrowmere field team.', 'command',"
                            + " CASE WHEN alert_id % 7 = 0 THEN NULL ELSE format('w%s', lpad(:w::text, 2, '0')) END"
                            + " FROM " + s + ".alert WHERE superseded_at IS NULL AND (alert_id % 7 = 0 OR alert_id % 11 = 0)"
                            + " ORDER BY alert_id")
                    .bind("w", size.waves()).execute();
            h.createUpdate("INSERT INTO " + s + ".alert_action (alert_id, acted_at, actor, action, source)"
                    + " SELECT alert_id, superseded_at, 'wavewarden', 'SUPERSEDED', 'history' FROM " + s + ".alert"
                    + " WHERE superseded_at IS NOT NULL ORDER BY alert_id").execute();
            // Sign-offs of every wave but the last two, on its current run.
            h.createUpdate("INSERT INTO " + s + ".sign_off (dataset, wave, actor, signed_at, run_id, config_fingerprint,"
                            + " tool_version) SELECT dataset, wave, 'Ines Calloway', finished_at + interval '2 days',"
                            + " run_id, config_fingerprint, tool_version FROM " + s + ".run WHERE superseded_at IS NULL"
                            + " AND wave <= format('w%s', lpad((:w - 2)::text, 2, '0')) ORDER BY run_id")
                    .bind("w", size.waves()).execute();
            // A run writes its findings together, so they lie together in the table; the statements above wrote
            // them variable by variable across runs. Ordering them by run gives the layout a real history has.
            h.execute("CLUSTER " + s + ".finding USING finding_run");
            for (String table : new String[]{"run", "finding", "alert", "alert_action", "sign_off"}) {
                h.execute("ANALYZE " + s + "." + table);
            }
            long runs = count(h, s, "run");
            return new Written(runs, count(h, s, "finding"), count(h, s, "alert"), count(h, s, "alert_action"),
                    count(h, s, "sign_off"), (System.nanoTime() - started) / 1_000_000);
        });
    }

    private static long count(org.jdbi.v3.core.Handle h, String s, String table) {
        return h.createQuery("SELECT count(*) FROM " + s + "." + table).mapTo(Long.class).one();
    }
}
