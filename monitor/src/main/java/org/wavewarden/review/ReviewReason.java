package org.wavewarden.review;

import org.wavewarden.config.EnumKeys;

import java.util.Optional;

/** Why an alert was explained or muted, in categories a release report can count. */
public enum ReviewReason {
    /** Expected from a change of the design, the mode or the questionnaire. */
    PLANNED_CHANGE("planned-change", "expected from a design, mode or questionnaire change"),
    /** A data error that is being fixed upstream. */
    FIX_UPSTREAM("fix-upstream", "a data error being fixed upstream"),
    /** Accepted as a real change in the population. */
    REAL_CHANGE("real-change", "accepted as a real change"),
    /** Looked at; not a problem. */
    NO_PROBLEM("no-problem", "looked at: not a problem");

    private final String key;
    private final String meaning;

    ReviewReason(String key, String meaning) {
        this.key = key;
        this.meaning = meaning;
    }

    /** The name used in the configuration, on the command line and in the results schema. */
    public String key() {
        return key;
    }

    public String meaning() {
        return meaning;
    }

    /** The reason written as its key or its name, in any case; empty for anything else. */
    public static Optional<ReviewReason> parse(String text) {
        return EnumKeys.parse(ReviewReason.class, ReviewReason::key, text);
    }

    /** The keys, for error messages. */
    public static String keys() {
        return EnumKeys.listed(ReviewReason.class, ReviewReason::key);
    }
}
