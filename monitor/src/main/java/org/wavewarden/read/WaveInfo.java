package org.wavewarden.read;

/**
 * One wave in the source: its label, how many rows it has now, and (when the listing was asked for it) a content
 * fingerprint, the sum of the rows' hashes, which changes when a row is edited in place.
 */
public record WaveInfo(String wave, long rows, long fingerprint) {

    public WaveInfo(String wave, long rows) {
        this(wave, rows, 0);
    }
}
