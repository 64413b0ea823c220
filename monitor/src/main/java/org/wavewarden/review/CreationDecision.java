package org.wavewarden.review;

import java.time.LocalDate;

/**
 * What the configuration decides for an alert when it is created: explained by an expected change, or muted by a
 * rule. An alert without a decision is created open.
 *
 * @param action     EXPLAINED or MUTED
 * @param reason     the reason category (for a mute rule, null unless it names one)
 * @param note       free text: the expected change's note or the mute rule's reason, naming the rule
 * @param actor      the person the configuration names as having declared it
 * @param source     where the decision came from, e.g. {@code config: expectedChanges[0]} or {@code mute rule 12}
 * @param untilWave  for a mute, the last wave its rule mutes; null otherwise or when it ends by date only
 * @param untilDate  for a mute, the last day its rule holds (UTC), after which the alert reads open as one muted by
 *                   a person until that day does; null otherwise or when it ends by wave only
 */
public record CreationDecision(ReviewAction action, ReviewReason reason, String note, String actor, String source,
                               String untilWave, LocalDate untilDate) {

    /** A decision without an expiry: an explanation, or a mute whose expiry is read from its stored rule. */
    public CreationDecision(ReviewAction action, ReviewReason reason, String note, String actor, String source) {
        this(action, reason, note, actor, source, null, null);
    }
}
