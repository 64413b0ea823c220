package org.wavewarden.review;

import java.time.Instant;
import java.time.LocalDate;

/**
 * One entry of an alert's history, never changed once written.
 *
 * @param actor     the person (or, for entries the monitor writes itself, {@code wavewarden})
 * @param reason    the reason category; null where the action takes none
 * @param note      free text; null for none
 * @param source    where the action came from: {@code command}, {@code console}, {@code config: ...}, {@code run N}
 * @param untilWave for a mute: the last wave muted, or null
 * @param untilDate for a mute: the last day muted, or null
 */
public record ReviewEntry(long entryId, long alertId, Instant at, String actor, ReviewAction action,
                          ReviewReason reason, String note, String source, String untilWave, LocalDate untilDate) {
}
