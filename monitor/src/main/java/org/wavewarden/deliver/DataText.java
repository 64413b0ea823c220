package org.wavewarden.deliver;

import java.util.Locale;

/**
 * Text that comes from the data (wave and release labels, column names, category values, and the sentences that
 * quote them) as the plain-text outputs show it. Data is never markup and never moves the layout: a label may
 * hold a line break, a tab, a bidirectional override or Markdown syntax, and still shows as what it is.
 */
public final class DataText {

    /**
     * Characters that start or end Markdown or HTML syntax inside a line: emphasis, code spans, links and images,
     * raw HTML and entities, table cells, strikethrough, headings, math and attribute lists. Escaping them with a
     * backslash is valid CommonMark for every ASCII punctuation character and renders the character itself.
     */
    private static final String MARKDOWN_INLINE = "\\`*_[]<>|~&#${}";

    private DataText() {
    }

    /**
     * Control, format and line-separator characters made visible: tab as {@code \t}, line feed as {@code \n},
     * carriage return as {@code \r}, any other as {@code \\uXXXX}. The result is always one line.
     */
    public static String visible(String s) {
        if (s == null) {
            return "";
        }
        StringBuilder sb = new StringBuilder(s.length());
        s.codePoints().forEach(cp -> {
            if (cp == '\t') {
                sb.append("\\t");
            } else if (cp == '\n') {
                sb.append("\\n");
            } else if (cp == '\r') {
                sb.append("\\r");
            } else if (Character.isISOControl(cp) || Character.getType(cp) == Character.FORMAT
                    || Character.getType(cp) == Character.LINE_SEPARATOR
                    || Character.getType(cp) == Character.PARAGRAPH_SEPARATOR) {
                sb.append(String.format(Locale.ROOT, "\\u%04X", cp));
            } else {
                sb.appendCodePoint(cp);
            }
        });
        return sb.toString();
    }

    /**
     * The one escaping of data for Markdown: {@link #visible(String) visible} (so one line), then every character
     * that could open inline syntax backslash-escaped, and a leading list, quote or numbered-list marker escaped
     * so the text cannot start a block where it begins a line or a list item. The result renders as exactly the
     * visible text, inert, inside a paragraph, a heading, a list item or a table cell.
     */
    public static String markdown(String s) {
        String v = visible(s);
        StringBuilder sb = new StringBuilder(v.length() + 16);
        int first = 0;
        while (first < v.length() && v.charAt(first) == ' ') {
            first++;
        }
        int digitsEnd = first;
        while (digitsEnd < v.length() && v.charAt(digitsEnd) >= '0' && v.charAt(digitsEnd) <= '9') {
            digitsEnd++;
        }
        for (int i = 0; i < v.length(); i++) {
            char c = v.charAt(i);
            boolean blockMarker = (i == first && "-+=>".indexOf(c) >= 0)
                    || (i == digitsEnd && digitsEnd > first && (c == '.' || c == ')'));
            // A backslash escapes only ASCII punctuation; before anything else (the t of a visible tab) it is
            // itself, so it is doubled only where it could escape what follows, this text's or the next.
            boolean escapingBackslash = c == '\\' && (i + 1 == v.length() || isAsciiPunctuation(v.charAt(i + 1)));
            if ((c != '\\' && MARKDOWN_INLINE.indexOf(c) >= 0) || escapingBackslash || blockMarker) {
                sb.append('\\');
            }
            sb.append(c);
        }
        return sb.toString();
    }

    private static boolean isAsciiPunctuation(char c) {
        return c > ' ' && c < 127 && !Character.isLetterOrDigit(c);
    }
}
