package org.wavewarden.missing;

import java.util.Objects;

/**
 * One codebook entry that stands for "no answer" rather than an answer, e.g. {@code 999 = "don't know"},
 * {@code -1 = "not applicable"} or {@code "" = "blank"}.
 *
 * <p>Codes such as 7/77/777 for refusals and 9/99/999 for "don't know" are common practice in survey codebooks
 * (there is no single source for them); the codebook of each variable says which apply.
 *
 * @param value  the code as written in the codebook (compared with the raw values by {@link Codebook#reasonOf})
 * @param reason a short label for why the answer is missing, e.g. "refused"; counts are reported per reason
 */
public record MissingCode(String value, String reason) {

    public MissingCode {
        Objects.requireNonNull(value, "value");
        Objects.requireNonNull(reason, "reason");
        if (reason.isBlank()) {
            throw new IllegalArgumentException("reason must not be blank (code value '" + value + "')");
        }
    }
}
