package org.wavewarden.store;

import org.jdbi.v3.core.Jdbi;
import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.config.Identifiers;
import org.wavewarden.deliver.Json;

import java.time.Instant;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.Optional;

/**
 * The codebook each wave was delivered with, in the results schema ({@code wave_codebook}): written by the import,
 * read when the wave is judged. Keyed by dataset and wave; saving a wave again replaces its row.
 */
public final class WaveCodebooks {

    private final Jdbi jdbi;
    private final String s;

    public WaveCodebooks(Jdbi jdbi, String schema) {
        this.jdbi = jdbi;
        this.s = Identifiers.quote(schema);
    }

    public void save(String dataset, String wave, DatasetCodebook codebook, Instant importedAt) {
        jdbi.useHandle(h -> h.createUpdate("INSERT INTO " + s + ".wave_codebook (dataset, wave, source, imported_at,"
                        + " codebook) VALUES (:d, :w, :src, :at, CAST(:cb AS jsonb)) ON CONFLICT (dataset, wave) DO"
                        + " UPDATE SET source = EXCLUDED.source, imported_at = EXCLUDED.imported_at,"
                        + " codebook = EXCLUDED.codebook")
                .bind("d", dataset).bind("w", wave).bind("src", codebook.source() == null ? "" : codebook.source())
                .bind("at", OffsetDateTime.ofInstant(importedAt, ZoneOffset.UTC))
                .bind("cb", Json.write(codebook)).execute());
    }

    /**
     * Forgets the codebook of a wave loaded again without one, so the new rows are never read with the labels of
     * the file they replaced.
     *
     * @return whether there was one
     */
    public boolean delete(String dataset, String wave) {
        return jdbi.withHandle(h -> h.createUpdate("DELETE FROM " + s + ".wave_codebook WHERE dataset = :d AND"
                + " wave = :w").bind("d", dataset).bind("w", wave).execute()) > 0;
    }

    /** The codebook the wave was imported with, or empty when it was imported without one. */
    public Optional<DatasetCodebook> load(String dataset, String wave) {
        return jdbi.withHandle(h -> h.createQuery("SELECT codebook::text FROM " + s + ".wave_codebook WHERE dataset = :d"
                        + " AND wave = :w").bind("d", dataset).bind("w", wave).mapTo(String.class).findOne())
                .map(json -> Json.read(json, DatasetCodebook.class));
    }
}
