package org.wavewarden.review;

/**
 * What the configuration decides for an alert when it is created: explained by an expected change, or muted by a
 * rule. An alert without a decision is created open.
 *
 * @param action     EXPLAINED or MUTED
 * @param reason     the reason category (for a mute rule, null unless it names one)
 * @param note       free text: the expected change's note or the mute rule's reason, naming the rule
 * @param actor      the person the configuration names as having declared it
 * @param source     where the decision came from, e.g. {@code config: expectedChanges[0]} or {@code mute rule 12}
 */
public record CreationDecision(ReviewAction action, ReviewReason reason, String note, String actor, String source) {
}
