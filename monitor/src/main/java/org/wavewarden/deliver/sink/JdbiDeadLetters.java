package org.wavewarden.deliver.sink;

import org.jdbi.v3.core.Jdbi;
import org.wavewarden.config.Identifiers;

import java.util.List;
import java.util.Objects;

/** Dead letters in the results schema's {@code dead_letter} table (migration V3). */
public final class JdbiDeadLetters implements DeadLetters {

    private final Jdbi jdbi;
    private final String s;

    public JdbiDeadLetters(Jdbi jdbi, String schema) {
        this.jdbi = Objects.requireNonNull(jdbi, "jdbi");
        if (!Identifiers.isPlain(schema)) {
            throw new IllegalArgumentException("schema: expected a plain SQL identifier but got " + schema);
        }
        this.s = Identifiers.quote(schema);
    }

    @Override
    public void record(DeadLetter letter) {
        Objects.requireNonNull(letter, "letter");
        jdbi.useHandle(h -> h.createUpdate("INSERT INTO " + s + ".dead_letter (sink, dataset, wave, variable, kind,"
                        + " idempotency_key, payload, attempts, last_error) VALUES (:sink, :dataset, :wave, :variable,"
                        + " :kind, :key, CAST(:payload AS jsonb), :attempts, :lastError)"
                        + " ON CONFLICT ON CONSTRAINT dead_letter_key DO UPDATE SET"
                        + " attempts = dead_letter.attempts + EXCLUDED.attempts, last_error = EXCLUDED.last_error,"
                        + " payload = EXCLUDED.payload, last_failed_at = now()")
                .bind("sink", letter.sink()).bind("dataset", letter.dataset()).bind("wave", letter.wave())
                .bind("variable", letter.variable()).bind("kind", letter.kind()).bind("key", letter.idempotencyKey())
                .bind("payload", letter.payload()).bind("attempts", letter.attempts())
                .bind("lastError", letter.lastError())
                .execute());
    }

    /** The dead letters of one sink, oldest first. */
    public List<DeadLetter> list(String sink) {
        return jdbi.withHandle(h -> h.createQuery("SELECT sink, dataset, wave, variable, kind, idempotency_key,"
                        + " payload::text AS payload, attempts, last_error FROM " + s + ".dead_letter"
                        + " WHERE sink = :sink ORDER BY id")
                .bind("sink", sink)
                .map((rs, ctx) -> new DeadLetter(rs.getString("sink"), rs.getString("dataset"), rs.getString("wave"),
                        rs.getString("variable"), rs.getString("kind"), rs.getString("idempotency_key"),
                        rs.getString("payload"), rs.getInt("attempts"), rs.getString("last_error")))
                .list());
    }

    /** Why the last attempt on a dead letter failed, if there is one. */
    public java.util.Optional<String> lastError(String sink, String idempotencyKey) {
        return jdbi.withHandle(h -> h.createQuery("SELECT last_error FROM " + s + ".dead_letter WHERE sink = :sink"
                        + " AND idempotency_key = :key")
                .bind("sink", sink).bind("key", idempotencyKey).mapTo(String.class).findOne());
    }

    /** Forgets a dead letter once it has been delivered by other means; true when there was one. */
    public boolean remove(String sink, String idempotencyKey) {
        return jdbi.withHandle(h -> h.createUpdate("DELETE FROM " + s + ".dead_letter WHERE sink = :sink"
                        + " AND idempotency_key = :key")
                .bind("sink", sink).bind("key", idempotencyKey).execute()) > 0;
    }
}
