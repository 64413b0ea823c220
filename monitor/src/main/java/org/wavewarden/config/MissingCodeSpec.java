package org.wavewarden.config;

/** A codebook value that means "no answer", with the reason the codebook gives (refused, don't know, ...). */
public record MissingCodeSpec(String value, String reason) {
}
