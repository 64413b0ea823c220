package org.wavewarden.config;

import java.util.List;

/**
 * What a dataset's configuration decides about its alerts before anyone sees them: the changes expected ahead and
 * the mute rules.
 */
public record AlertRules(List<ExpectedChange> expectedChanges, List<MuteRule> mutes) {

    public static final AlertRules NONE = new AlertRules(List.of(), List.of());

    public AlertRules {
        expectedChanges = expectedChanges == null ? List.of() : List.copyOf(expectedChanges);
        mutes = mutes == null ? List.of() : List.copyOf(mutes);
    }
}
