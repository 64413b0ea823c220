package org.wavewarden.missing;

import java.text.Normalizer;
import java.util.Locale;
import java.util.Set;

/** Character-level views of raw text values: blanks, invisible characters, placeholder tokens, shape patterns. */
final class TextForms {

    /**
     * Tokens that people and export tools write for "no answer", in normalised form (see {@link #normalise}). Strong
     * tokens almost never are genuine answers; weak ones sometimes are (a one-letter code "x", "none" as an answer
     * to "which religion"), so they carry less confidence.
     */
    static final Set<String> STRONG_PLACEHOLDERS = Set.of(
            "n/a", "na", "n.a.", "n.a", "n a", "#n/a", "nan", "null", "<null>", "(null)", "nil", "missing", "unknown",
            "unk", "refused", "refusal", "don't know", "dont know", "do not know", "dk", "d/k", "not known",
            "not stated", "not specified", "not available", "not applicable", "no answer", "no response",
            "prefer not to say", "not given", "undefined", "void", "-", "--", "---", "?", "??", "???", "(blank)",
            "blank", "empty", "tbd", "#value!", "#ref!", "infinity", "-infinity");
    static final Set<String> WEAK_PLACEHOLDERS = Set.of("none", "x", "xx", "xxx", ".", "..", "...", "*", "**", "***",
            "/", "#", "_", "__");

    private TextForms() {
    }

    /** True for characters that render as nothing or as plain space but are not ASCII white space. */
    static boolean isInvisible(int cp) {
        return cp == 0x00A0 || cp == 0x200B || cp == 0x200C || cp == 0x200D || cp == 0xFEFF || cp == 0x2060
                || cp == 0x180E || cp == 0x00AD || cp == 0x2007 || cp == 0x202F
                || (Character.getType(cp) == Character.SPACE_SEPARATOR && cp != ' ')
                || Character.getType(cp) == Character.LINE_SEPARATOR
                || Character.getType(cp) == Character.PARAGRAPH_SEPARATOR;
    }

    static boolean isAsciiSpace(int cp) {
        return cp == ' ' || cp == '\t' || cp == '\n' || cp == '\r' || cp == 0x0B || cp == '\f';
    }

    /** Empty, or ASCII white space only. */
    static boolean isBlank(String v) {
        return v.codePoints().allMatch(TextForms::isAsciiSpace);
    }

    /** Not blank, but nothing except white space and invisible characters. */
    static boolean isInvisibleOnly(String v) {
        return !isBlank(v) && v.codePoints().allMatch(cp -> isAsciiSpace(cp) || isInvisible(cp));
    }

    /**
     * Case-folded, compatibility-normalised, invisible characters removed, apostrophe and dash variants unified,
     * white space collapsed and trimmed: "  Don’t  Know " becomes "don't know".
     */
    static String normalise(String v) {
        String s = Normalizer.normalize(v, Normalizer.Form.NFKC);
        StringBuilder b = new StringBuilder(s.length());
        s.codePoints().forEach(cp -> {
            if (isInvisible(cp) || isAsciiSpace(cp)) {
                b.append(' ');
            } else if (cp == 0x2018 || cp == 0x2019 || cp == 0x201B || cp == 0x0060 || cp == 0x00B4 || cp == 0x02BC
                    || cp == 0x2032) {
                b.append('\'');
            } else if (cp == 0x2010 || cp == 0x2011 || cp == 0x2012 || cp == 0x2013 || cp == 0x2014 || cp == 0x2212) {
                b.append('-');
            } else {
                b.appendCodePoint(cp);
            }
        });
        return b.toString().toLowerCase(Locale.ROOT).trim().replaceAll(" +", " ");
    }

    /** The normalised form with all punctuation and spaces dropped: "n.a." and "n/a" both become "na". */
    static String letters(String normalised) {
        return normalised.replaceAll("[^\\p{L}\\p{N}]", "");
    }

    /** 1.0 for a strong placeholder, 0.6 for a weak one, 0 otherwise. */
    static double placeholderStrength(String raw) {
        String n = normalise(raw);
        if (n.isEmpty()) {
            return 0;
        }
        if (STRONG_PLACEHOLDERS.contains(n)) {
            return 1.0;
        }
        String bare = letters(n);
        // Spellings such as "N / A", "n.a", "Don't-know", "NOT-STATED" differ only in punctuation.
        if (!bare.isEmpty() && (STRONG_PLACEHOLDERS.contains(bare) || STRONG_PLACEHOLDERS.contains(n.replace('-', ' '))
                || bare.equals("dontknow") || bare.equals("notstated") || bare.equals("notknown")
                || bare.equals("notapplicable") || bare.equals("noanswer") || bare.equals("notavailable"))) {
            return 1.0;
        }
        if (WEAK_PLACEHOLDERS.contains(n)) {
            return 0.6;
        }
        return 0;
    }

    /**
     * True for a token that means "no answer" wherever it stands: a strong placeholder, or a weak one of punctuation
     * alone (a lone "." is the system missing value of SAS and Stata exports; an answer list rarely offers bare
     * punctuation). Weak tokens with letters ("x", "none") can be genuine answers and are not known forms.
     */
    static boolean isKnownNoAnswerForm(String raw) {
        double strength = placeholderStrength(raw);
        return strength >= 1 || (strength > 0 && letters(normalise(raw)).isEmpty());
    }

    /**
     * The shape of a value: letters become A, digits 9, white space a single blank, other characters stay; runs of
     * the same class collapse, so "AB-1234" and "X-9" share the shape "A-9".
     */
    static String pattern(String v) {
        StringBuilder b = new StringBuilder();
        v.strip().codePoints().forEach(cp -> {
            char c;
            if (Character.isLetter(cp)) {
                c = 'A';
            } else if (Character.isDigit(cp)) {
                c = '9';
            } else if (Character.isWhitespace(cp) || isInvisible(cp)) {
                c = ' ';
            } else {
                b.appendCodePoint(cp);
                return;
            }
            if (b.length() == 0 || b.charAt(b.length() - 1) != c) {
                b.append(c);
            }
        });
        return b.toString();
    }

    /** The shape without collapsing runs, so "12345" and "123" differ ("99999" versus "999"). */
    static String fullPattern(String v) {
        StringBuilder b = new StringBuilder();
        v.strip().codePoints().forEach(cp -> {
            if (Character.isLetter(cp)) {
                b.append('A');
            } else if (Character.isDigit(cp)) {
                b.append('9');
            } else if (Character.isWhitespace(cp)) {
                b.append(' ');
            } else {
                b.appendCodePoint(cp);
            }
        });
        return b.toString();
    }
}
