package org.wavewarden.deliver;

import org.wavewarden.store.CaseLists;

import java.util.regex.Pattern;

/**
 * A case list as a CSV file (RFC 4180): the header {@code respondent_key,<variable>} (and the interviewer column for
 * an interviewer's list), then one line per kept case in respondent-key order, lines ending in CRLF. A capped list
 * ends with its last kept case: how many more matched is said by the digest ("first N of TOTAL"), never by a row
 * that a program reading the file would take for a case.
 *
 * <p>Cells: SQL NULL is an empty cell and an empty string a quoted empty cell ({@code ""}), so the two stay apart.
 * A cell holding a comma, a double quote, CR or LF is quoted with its quotes doubled. A cell that a spreadsheet
 * would run as a formula (starting with {@code = + - @}, a tab or CR; OWASP "CSV Injection") is made inert with a
 * leading apostrophe, unless it is a plain number: a missing code such as {@code -9} or {@code +1.5e3} stays
 * readable as the number it is, and a spreadsheet takes it as that number, not as a formula.
 */
public final class CaseListCsv {

    private static final Pattern NUMBER = Pattern.compile("[+-]?(\\d+(\\.\\d*)?|\\.\\d+)([eE][+-]?\\d+)?");

    private CaseListCsv() {
    }

    public static String render(CaseLists.CaseList list) {
        StringBuilder csv = new StringBuilder();
        csv.append(cell("respondent_key")).append(',').append(cell(list.variable()));
        boolean interviewer = list.interviewerColumn() != null;
        if (interviewer) {
            csv.append(',').append(cell(list.interviewerColumn()));
        }
        csv.append("\r\n");
        for (CaseLists.CaseRow row : list.rows()) {
            csv.append(cell(row.respondentKey())).append(',').append(cell(row.value()));
            if (interviewer) {
                csv.append(',').append(cell(list.interviewer()));
            }
            csv.append("\r\n");
        }
        return csv.toString();
    }

    /** One cell, inert and quoted as the class comment says; null is SQL NULL. */
    static String cell(String value) {
        if (value == null) {
            return "";
        }
        if (value.isEmpty()) {
            return "\"\"";
        }
        String v = value;
        char first = v.charAt(0);
        boolean formula = first == '=' || first == '+' || first == '-' || first == '@' || first == '\t'
                || first == '\r';
        if (formula && !NUMBER.matcher(v).matches()) {
            v = "'" + v;
        }
        if (v.indexOf(',') >= 0 || v.indexOf('"') >= 0 || v.indexOf('\r') >= 0 || v.indexOf('\n') >= 0) {
            return '"' + v.replace("\"", "\"\"") + '"';
        }
        return v;
    }
}
