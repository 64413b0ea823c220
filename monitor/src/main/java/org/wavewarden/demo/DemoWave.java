package org.wavewarden.demo;

/**
 * One wave of the demo survey: its label as stored in the {@code wave} column and how many households answered.
 *
 * @param label       the wave label, e.g. {@code 2024-Q3}; labels sort in time order
 * @param index       position in time order, from 0
 * @param respondents households interviewed in the wave
 */
public record DemoWave(String label, int index, int respondents) {

    public DemoWave {
        if (label == null || label.isBlank()) {
            throw new IllegalArgumentException("label must be a non-blank wave label");
        }
        if (index < 0) {
            throw new IllegalArgumentException("index must be >= 0, was " + index);
        }
        if (respondents <= 0) {
            throw new IllegalArgumentException("respondents must be > 0, was " + respondents);
        }
    }

    /** The file name the wave is committed under in the demo data folder. */
    public String fileName() {
        return label + ".csv";
    }
}
