package org.wavewarden.console.page;

import org.wavewarden.store.ConsoleReads;

import java.util.List;

/**
 * The console's pages as HTML text: pure functions of their records, every piece of data escaped, no script
 * needed, styles from {@code /console/static/console.css} only (the pages are served with a content security policy
 * that refuses inline styles and scripts). The element ids and form field names below are the console's contract
 * with its routes and its browser tests; see {@link org.wavewarden.console.ConsoleApp} for the routes.
 */
public final class Pages {

    private Pages() {
    }

    /** {@code GET /console}: table {@code #datasets}, one row per dataset. */
    public static String overview(Chrome chrome, List<OverviewRow> rows) {
        throw new UnsupportedOperationException("not yet");
    }

    /** {@code GET /console/dataset}: filter form {@code #grid-filter}, legend {@code #legend}, table {@code #grid}. */
    public static String grid(Chrome chrome, ConsoleReads.Grid grid, ConsoleReads.GridFilter filter) {
        throw new UnsupportedOperationException("not yet");
    }

    /**
     * {@code GET /console/finding}: {@code #sentence}, {@code #numbers}, {@code #plot}, {@code #trend},
     * {@code #history}, {@code #cautions}; forms {@code #explain-form}, {@code #mute-form}, {@code #unmute-form} when
     * the person may act and the finding has an alert.
     */
    public static String finding(Chrome chrome, ConsoleReads.FindingView finding) {
        throw new UnsupportedOperationException("not yet");
    }

    /**
     * {@code GET /console/wave}: sections {@code #alerts-open}, {@code #alerts-explained}, {@code #alerts-muted},
     * {@code #alerts-superseded}; {@code #signoff-record}; form {@code #signoff-form} for a releaser;
     * {@code #downloads}. {@code refusal}, when not null, says why a sign-off was just refused (shown in
     * {@code #refusal}).
     */
    public static String wave(Chrome chrome, ConsoleReads.WaveView wave, String refusal) {
        throw new UnsupportedOperationException("not yet");
    }

    /** {@code GET /console/search}: table {@code #search-results}. */
    public static String search(Chrome chrome, String query, List<ConsoleReads.SearchHit> hits) {
        throw new UnsupportedOperationException("not yet");
    }

    /** {@code GET /console/login}: form {@code #login-form}; {@code error} in {@code #login-error} when not null. */
    public static String login(String csrfToken, String error, String next) {
        throw new UnsupportedOperationException("not yet");
    }

    /** A refusal or an error (403, 404, 409, ...): the message in {@code #problem}. */
    public static String problem(Chrome chrome, int status, String message) {
        throw new UnsupportedOperationException("not yet");
    }

    /** The console's style sheet, served at {@code /console/static/console.css}. */
    public static String css() {
        throw new UnsupportedOperationException("not yet");
    }
}
