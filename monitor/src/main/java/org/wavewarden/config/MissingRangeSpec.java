package org.wavewarden.config;

/**
 * A range of values that all mean "no answer" (an SPSS user-missing range such as {@code -99 THRU -91}, a DDI
 * invalid range), with the reason the codebook gives. Both ends are included; an open end is null ({@code LO},
 * {@code HI}).
 */
public record MissingRangeSpec(Double low, Double high, String reason) {
}
