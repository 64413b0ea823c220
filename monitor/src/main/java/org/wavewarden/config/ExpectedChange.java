package org.wavewarden.config;

import org.wavewarden.review.ReviewReason;

/**
 * A change declared before it shows: alerts of matching variables in the wave range are explained when they are
 * created (for example a mode change known before fieldwork).
 *
 * @param variable a variable name, or a pattern with {@code *} standing for any run of characters
 * @param fromWave the first wave it applies to (inclusive)
 * @param toWave   the last wave it applies to (inclusive); equal to {@code fromWave} for one wave
 * @param reason   the reason category recorded on the explained alerts
 * @param note     free text recorded with it
 * @param who      the person who declared it
 */
public record ExpectedChange(String variable, String fromWave, String toWave, ReviewReason reason, String note,
                             String who) {
}
