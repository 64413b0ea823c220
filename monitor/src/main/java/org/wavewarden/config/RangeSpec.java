package org.wavewarden.config;

/** The declared valid range of a numeric variable; either bound may be absent. */
public record RangeSpec(Double min, Double max) {
}
