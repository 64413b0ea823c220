package org.wavewarden.deliver.html;

/** Escaping for text and attribute values in HTML and inline SVG. */
public final class Html {

    private Html() {
    }

    /**
     * Escapes the five characters that can end a text node or a quoted attribute, so text from the data (a
     * category label, a variable name) can never become markup. Control characters other than tab and newline are
     * dropped because they are not allowed in HTML text.
     */
    public static String esc(String s) {
        if (s == null) {
            return "";
        }
        StringBuilder sb = new StringBuilder(s.length() + 16);
        for (int i = 0; i < s.length(); i++) {
            char ch = s.charAt(i);
            switch (ch) {
                case '&' -> sb.append("&amp;");
                case '<' -> sb.append("&lt;");
                case '>' -> sb.append("&gt;");
                case '"' -> sb.append("&quot;");
                case '\'' -> sb.append("&#39;");
                default -> {
                    if (ch >= 0x20 || ch == '\n' || ch == '\t') {
                        sb.append(ch);
                    }
                }
            }
        }
        return sb.toString();
    }
}
