package org.wavewarden.daemon;

import org.jdbi.v3.core.Jdbi;
import org.wavewarden.config.Identifiers;
import org.wavewarden.deliver.sink.AlertMessage;
import org.wavewarden.deliver.sink.AlertSink;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;

import java.util.List;
import java.util.Map;

/**
 * Delivers every open alert of a dataset to each of its sinks, once per sink, from the alerts table: a sink that
 * fails keeps its alerts pending for the next firing, and an alert whose run committed just before a crash is
 * still delivered. Sinks are idempotent by the message key, so a delivery repeated after a crash between sending
 * and recording is harmless.
 */
final class AlertOutbox {

    private final Jdbi jdbi;
    private final String s;
    private final Map<String, List<AlertSink>> sinksByDataset;

    AlertOutbox(Jdbi jdbi, String schema, Map<String, List<AlertSink>> sinksByDataset) {
        this.jdbi = jdbi;
        this.s = Identifiers.quote(schema);
        this.sinksByDataset = Map.copyOf(sinksByDataset);
    }

    record Pending(long alertId, AlertMessage message) {
    }

    /** Delivers what is pending; returns how many alerts each sink took. */
    void flush(String dataset) {
        for (AlertSink sink : sinksByDataset.getOrDefault(dataset, List.of())) {
            List<Pending> pending = pending(dataset, sink.name());
            if (pending.isEmpty()) {
                continue;
            }
            sink.deliver(pending.stream().map(Pending::message).toList());
            jdbi.useTransaction(h -> {
                var b = h.prepareBatch("INSERT INTO " + s + ".alert_delivery (alert_id, sink) VALUES (:id, :sink)"
                        + " ON CONFLICT DO NOTHING");
                pending.forEach(p -> b.bind("id", p.alertId()).bind("sink", sink.name()).add());
                b.execute();
            });
        }
    }

    private List<Pending> pending(String dataset, String sink) {
        return jdbi.withHandle(h -> h.createQuery("SELECT a.alert_id, a.wave, a.against_wave, a.variable, a.kind,"
                        + " a.verdict, a.sentence, a.run_id, r.summary_checksum, f.test, f.statistic, f.p_value, f.q_value,"
                        + " f.effect_name, f.effect_estimate, f.effect_ci_low, f.effect_ci_high, f.effect_threshold,"
                        + " f.n_baseline, f.n_current FROM " + s + ".alert a JOIN " + s + ".run r ON r.run_id = a.run_id"
                        + " LEFT JOIN " + s + ".finding f ON f.run_id = a.run_id AND f.variable = a.variable"
                        + " AND f.kind = a.kind WHERE a.dataset = :d AND a.superseded_at IS NULL AND NOT EXISTS"
                        + " (SELECT 1 FROM " + s + ".alert_delivery x WHERE x.alert_id = a.alert_id AND x.sink = :sink)"
                        + " ORDER BY a.alert_id")
                .bind("d", dataset).bind("sink", sink)
                .map((rs, ctx) -> {
                    String effectName = rs.getString("effect_name");
                    Finding.Effect effect = effectName == null ? null : new Finding.Effect(effectName,
                            rs.getDouble("effect_estimate"), rs.getDouble("effect_ci_low"),
                            rs.getDouble("effect_ci_high"), rs.getDouble("effect_threshold"));
                    String verdict = rs.getString("verdict");
                    Finding f = new Finding(rs.getString("variable"), FindingKind.valueOf(rs.getString("kind")),
                            rs.getString("test"), (Double) rs.getObject("statistic"), (Double) rs.getObject("p_value"),
                            (Double) rs.getObject("q_value"), effect, verdict == null ? null : Verdict.valueOf(verdict),
                            (Long) rs.getObject("n_baseline"), (Long) rs.getObject("n_current"),
                            rs.getString("sentence"), null);
                    String against = rs.getString("against_wave");
                    return new Pending(rs.getLong("alert_id"), AlertMessage.of(dataset, rs.getString("wave"),
                            against.isEmpty() ? null : against, rs.getLong("run_id"),
                            rs.getString("summary_checksum"), f));
                })
                .list());
    }
}
