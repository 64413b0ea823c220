package org.wavewarden.read;

/** One wave in the source: its label and how many rows it has now. */
public record WaveInfo(String wave, long rows) {
}
