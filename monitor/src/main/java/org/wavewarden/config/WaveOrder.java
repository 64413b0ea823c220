package org.wavewarden.config;

import java.util.List;

/**
 * How waves are ordered: {@code natural} sorts the labels (numerically when every label is a number, otherwise
 * as text, which suits labels such as {@code 2025-Q1}); an explicit list fixes the order and names every wave.
 */
public record WaveOrder(List<String> explicit) {

    public static final WaveOrder NATURAL = new WaveOrder(List.of());

    public WaveOrder {
        explicit = List.copyOf(explicit);
    }

    public boolean isNatural() {
        return explicit.isEmpty();
    }
}
