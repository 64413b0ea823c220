package org.wavewarden.codebook;

import java.util.Locale;

/**
 * The one rule for the column a file's or codebook's variable becomes in a table: lower case (SPSS names are
 * case-insensitive and a mixed-case PostgreSQL name must be quoted for ever after), every character outside letters,
 * digits and underscore replaced by an underscore, a leading digit prefixed with {@code v_}, cut to 63 characters
 * (PostgreSQL's limit on a name). A codebook's variables are matched to the table's columns in this form.
 */
public final class ColumnNames {

    private ColumnNames() {
    }

    public static String of(String fileName) {
        String s = fileName.strip().toLowerCase(Locale.ROOT).replaceAll("[^a-z0-9_]", "_");
        if (s.isEmpty() || Character.isDigit(s.charAt(0))) {
            s = "v_" + s;
        }
        return s.length() > 63 ? s.substring(0, 63) : s;
    }
}
