package org.wavewarden.config;

import org.wavewarden.judge.FindingKind;

import java.time.LocalDate;

/**
 * Alerts that are recorded but never delivered, until an expiry. A muted alert is shown in the digest's muted
 * section. The dataset is the rule's scope (rules are listed per dataset); variable and kind narrow it.
 *
 * @param variable   a variable name or a pattern with {@code *}; null for every variable
 * @param kind       a finding kind; null for every kind
 * @param untilWave  the last wave muted (inclusive); null when the rule ends by date only
 * @param untilDate  the last day muted (inclusive, UTC); null when the rule ends by wave only
 * @param reason     why, in words
 * @param who        the person who muted
 */
public record MuteRule(String variable, FindingKind kind, String untilWave, LocalDate untilDate, String reason,
                       String who) {
}
