package org.wavewarden.console;

import com.fasterxml.jackson.databind.SerializationFeature;
import org.eclipse.jetty.http.HttpHeader;
import org.eclipse.jetty.server.FormFields;
import org.eclipse.jetty.server.Request;
import org.eclipse.jetty.util.Fields;
import org.jdbi.v3.core.Jdbi;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.console.auth.ConsoleAuth;
import org.wavewarden.console.auth.Session;
import org.wavewarden.console.page.Chrome;
import org.wavewarden.console.page.OverviewRow;
import org.wavewarden.console.page.Pages;
import org.wavewarden.daemon.Router;
import org.wavewarden.daemon.Router.Reply;
import org.wavewarden.deliver.DataText;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.deliver.Json;
import org.wavewarden.deliver.MarkdownDigest;
import org.wavewarden.deliver.OutputPaths;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;
import org.wavewarden.review.ReviewException;
import org.wavewarden.review.ReviewReason;
import org.wavewarden.review.Role;
import org.wavewarden.store.AlertReviews;
import org.wavewarden.store.ConsoleReads;
import org.wavewarden.store.ReleaseComparisons;
import org.wavewarden.store.ResultsStore;
import org.wavewarden.store.SignOffs;

import java.math.BigDecimal;
import java.net.URI;
import java.nio.charset.StandardCharsets;
import java.time.Clock;
import java.time.LocalDate;
import java.time.format.DateTimeParseException;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import java.util.function.Function;
import java.util.regex.Pattern;

/**
 * The web console's routes, added to the daemon's router (or the standalone {@code console} command's). Every page
 * needs a session; every POST needs the session's CSRF token; every action goes through the same lifecycle code as
 * the commands ({@code store.AlertReviews}, {@code store.SignOffs}) with the logged-in person as the actor and
 * {@code console} as the source.
 *
 * <pre>
 * GET  /console                                  datasets overview
 * GET  /console/dataset?name=D[&amp;kind=K&amp;verdict=V] variables by waves
 * GET  /console/finding?id=N                      a finding, its trend, its alert's history, the forms
 * GET  /console/wave?dataset=D&amp;wave=W             a wave's alerts by state, sign-off, downloads
 * GET  /console/search?q=TEXT                     variables by name or label across datasets
 * GET  /console/download?dataset=D&amp;wave=W&amp;file=findings.json|digest.md|releases.json|releases.md
 * GET  /console/static/console.css
 * GET  /console/login, POST /console/login        fields name, password, csrf, next
 * POST /console/logout                            field csrf
 * POST /console/alert/explain                     fields alert, reason, note, csrf
 * POST /console/alert/mute                        fields alert, reason, note, untilWave, untilDate, csrf
 * POST /console/alert/unmute                      fields alert, note, csrf
 * POST /console/signoff                           fields dataset, wave, run, release, force, reason, csrf
 * </pre>
 * A successful POST answers 303 to the page it came from with a notice; a missing or wrong CSRF token is 403, a
 * role that does not allow the action is 403, an action the lifecycle refuses is 409 with its reason.
 */
public final class ConsoleApp {

    private static final Logger LOG = LoggerFactory.getLogger(ConsoleApp.class);

    /** What the browser may load and where forms may go: the console's own style sheet and nothing else. */
    public static final String CONTENT_SECURITY_POLICY = "default-src 'none'; style-src 'self'; img-src 'self' data:;"
            + " form-action 'self'; frame-ancestors 'none'; base-uri 'none'";
    /** The source recorded with every action taken in the console. */
    public static final String SOURCE = "console";
    /** The text of the 403 a form without its valid token gets. */
    public static final String CSRF_REFUSAL = "The form's security token is missing or has expired; reload the page"
            + " and try again.";
    /** The text of a refused login; it does not say whether the name or the password was wrong. */
    public static final String LOGIN_REFUSAL = "Name or password not recognised.";
    /** The health line of a dataset when no daemon runs it in this process. */
    public static final String NO_DAEMON = "not scheduled here: this console runs without the daemon";

    /** The console's forms are a few short fields; anything larger is not one of them. */
    static final int MAX_FORM_BYTES = 64 * 1024;
    static final int MAX_FORM_FIELDS = 32;
    /** Longest note or reason kept from a form (a paragraph, not a document). */
    static final int MAX_TEXT = 4000;
    static final int MAX_SEARCH = 200;
    static final int SEARCH_LIMIT = 200;

    /**
     * Notices after an action travel in the redirect as a short code mapped to fixed text, so that nothing a request
     * carries is ever shown back as a message.
     */
    static final Map<String, String> NOTICES = Map.of(
            "explained", "The alert was explained.",
            "muted", "The alert was muted.",
            "unmuted", "The alert was unmuted: it is open again.",
            "signedoff", "The wave was signed off.");

    private static final Pattern ID = Pattern.compile("[1-9][0-9]{0,17}");
    /** A path of this console, with its query: what a login may go on to, what an action may return to. */
    private static final Pattern CONSOLE_PATH = Pattern.compile("/console(/[A-Za-z0-9._~/-]*)?(\\?[A-Za-z0-9._~%&=+-]*)?");

    private final WardenConfig config;
    private final Jdbi jdbi;
    private final Clock clock;
    private final Function<String, String> health;
    private final ConsoleAuth auth;
    private final ConsoleReads reads;
    private final AlertReviews reviews;
    private final SignOffs signOffs;
    private final ResultsStore store;

    /**
     * @param health a dataset's health line from the daemon, or null when no daemon runs here (standalone)
     */
    public ConsoleApp(WardenConfig config, Jdbi jdbi, Clock clock, Function<String, String> health) {
        this.config = Objects.requireNonNull(config, "config");
        this.jdbi = Objects.requireNonNull(jdbi, "jdbi");
        this.clock = Objects.requireNonNull(clock, "clock");
        this.health = health;
        String schema = config.results().schema();
        this.auth = new ConsoleAuth(config.console(), clock);
        this.reads = new ConsoleReads(jdbi, schema);
        this.reviews = new AlertReviews(jdbi, schema, clock);
        this.signOffs = new SignOffs(jdbi, schema, clock);
        this.store = new ResultsStore(jdbi, schema);
    }

    /** Adds the console's routes to {@code router} (before the server starts). */
    public Router install(Router router) {
        router.get("/console", secured(r -> page(r, this::overview)))
                .get("/console/dataset", secured(r -> page(r, this::grid)))
                .get("/console/finding", secured(r -> page(r, this::finding)))
                .get("/console/wave", secured(r -> page(r, this::wave)))
                .get("/console/search", secured(r -> page(r, this::search)))
                .get("/console/download", secured(r -> page(r, this::download)))
                .get("/console/cases", secured(r -> page(r, this::cases)))
                .get("/console/static/console.css", secured(r -> Reply.of(200, "text/css; charset=utf-8",
                        Pages.css())))
                .get("/console/login", secured(this::loginForm))
                .route("POST", "/console/login", secured(this::login))
                .route("POST", "/console/logout", secured(r -> action(r, null, this::logout)))
                .route("POST", "/console/alert/explain", secured(r -> action(r, Role.STEWARD, this::explain)))
                .route("POST", "/console/alert/mute", secured(r -> action(r, Role.STEWARD, this::mute)))
                .route("POST", "/console/alert/unmute", secured(r -> action(r, Role.STEWARD, this::unmute)))
                .route("POST", "/console/signoff", secured(r -> action(r, Role.RELEASER, this::signOff)));
        return router;
    }

    // ---- the frame every route runs in ----------------------------------------------------------------------

    /** A page's work once the person is known. */
    @FunctionalInterface
    private interface PageBody {
        Reply answer(Request request, Fields query, Session session, Chrome chrome) throws Exception;
    }

    /** An action's work once the person, the token and the role have been checked. */
    @FunctionalInterface
    private interface ActionBody {
        Reply answer(Request request, Fields form, Session session) throws Exception;
    }

    /** A request the console cannot read (a bad id, a value outside its choices): 400 with a plain message. */
    static final class BadRequest extends RuntimeException {
        BadRequest(String message) {
            super(message, null, false, false);
        }
    }

    /** The security headers on every console reply, and the one place a failure becomes a reply. */
    private static Router.Endpoint secured(Router.Endpoint endpoint) {
        return request -> {
            Reply reply;
            try {
                reply = endpoint.answer(request);
            } catch (BadRequest e) {
                reply = Reply.text(400, e.getMessage() + "\n");
            } catch (Exception e) {
                // The message may carry database details or bound values (a note, a name): the client gets none of
                // it, and the log names the class and where it was thrown, not the message.
                LOG.warn("{} {} failed: {} at {}", request.getMethod(), Request.getPathInContext(request),
                        e.getClass().getName(), e.getStackTrace().length == 0 ? "?" : e.getStackTrace()[0]);
                reply = Reply.text(500, "internal error\n");
            }
            return reply.with("Content-Security-Policy", CONTENT_SECURITY_POLICY)
                    .with("X-Frame-Options", "DENY")
                    .with("Referrer-Policy", "same-origin");
        };
    }

    private Reply page(Request request, PageBody body) throws Exception {
        Optional<Session> session = session(request);
        if (session.isEmpty()) {
            String here = request.getHttpURI().getPathQuery();
            return redirect("/console/login?next=" + encode(safeNext(here)));
        }
        Fields query = query(request);
        String done = query.getValue("done");
        String notice = done == null ? null : NOTICES.get(done);
        Session s = session.get();
        return body.answer(request, query, s, new Chrome(s.principal().name(), s.principal().role(), s.csrfToken(),
                notice));
    }

    private Reply action(Request request, Role needed, ActionBody body) throws Exception {
        Optional<Session> session = session(request);
        if (session.isEmpty()) {
            return redirect("/console/login");
        }
        Session s = session.get();
        Chrome chrome = new Chrome(s.principal().name(), s.principal().role(), s.csrfToken(), null);
        Fields form = form(request);
        if (!auth.csrfValid(s, form.getValue("csrf"))) {
            return html(403, Pages.problem(chrome, 403, CSRF_REFUSAL));
        }
        if (needed != null && !s.principal().role().includes(needed)) {
            return html(403, Pages.problem(chrome, 403, "This needs the " + needed.key() + " role; you are logged in"
                    + " as a " + s.principal().role().key() + "."));
        }
        try {
            return body.answer(request, form, s);
        } catch (ReviewException e) {
            return html(409, Pages.problem(chrome, 409, e.getMessage()));
        }
    }

    private Optional<Session> session(Request request) {
        // Exactly one value: a proxy that adds its header to one the client sent (instead of replacing it) would
        // otherwise let the client's name through, and with it any configured person's role.
        List<String> named = config.console().proxy() == null ? List.of()
                : request.getHeaders().getValuesList(config.console().proxy().userHeader());
        String proxyUser = named.size() == 1 ? named.get(0) : null;
        return auth.session(cookies(request), proxyUser, Request.getRemoteAddr(request));
    }

    /** Every Cookie header of the request as one header value. */
    private static String cookies(Request request) {
        List<String> all = request.getHeaders().getValuesList(HttpHeader.COOKIE);
        return all.isEmpty() ? null : String.join("; ", all);
    }

    /** The query's parameters; a query that is not percent-encoded UTF-8 is the client's error, a 400. */
    private static Fields query(Request request) {
        try {
            return Request.extractQueryParameters(request, StandardCharsets.UTF_8);
        } catch (RuntimeException e) {
            throw new BadRequest("the request could not be read");
        }
    }

    private static Fields form(Request request) {
        try {
            return FormFields.getFields(request, MAX_FORM_FIELDS, MAX_FORM_BYTES);
        } catch (RuntimeException e) {
            throw new BadRequest("the form could not be read: it is larger than a console form or not url-encoded");
        }
    }

    // ---- pages ----------------------------------------------------------------------------------------------

    private Reply overview(Request request, Fields query, Session session, Chrome chrome) {
        List<OverviewRow> rows = new ArrayList<>();
        for (ConsoleReads.DatasetSummary summary : reads.datasets()) {
            DatasetConfig d = dataset(summary.dataset());
            rows.add(new OverviewRow(summary, d == null ? null : d.schedule(),
                    health == null ? NO_DAEMON : health.apply(summary.dataset())));
        }
        return html(200, Pages.overview(chrome, rows));
    }

    private Reply grid(Request request, Fields query, Session session, Chrome chrome) {
        String name = required(query, "name");
        String kind = choice(query, "kind", Arrays.stream(FindingKind.values()).map(Enum::name).toList());
        List<String> verdicts = new ArrayList<>(Arrays.stream(Verdict.values()).map(Enum::name).toList());
        verdicts.add("none");
        String verdict = choice(query, "verdict", verdicts);
        ConsoleReads.GridFilter filter = new ConsoleReads.GridFilter(kind, verdict);
        ConsoleReads.Grid grid = reads.grid(name, filter, waveOrder(name));
        if (grid.waves().isEmpty() && dataset(name) == null) {
            return html(404, Pages.problem(chrome, 404, "There are no results for a dataset of that name."));
        }
        return html(200, Pages.grid(chrome, grid, filter));
    }

    private Reply finding(Request request, Fields query, Session session, Chrome chrome) {
        long id = id(query.getValue("id"), "id");
        // The dataset, and so its wave order, is known only once the finding is read: the trend is put in that
        // order afterwards when the configuration fixes one.
        Optional<ConsoleReads.FindingView> found = reads.finding(id, NATURAL_WAVES);
        if (found.isEmpty()) {
            return html(404, Pages.problem(chrome, 404, "There is no finding " + id + "."));
        }
        ConsoleReads.FindingView v = found.get();
        DatasetConfig d = dataset(v.dataset());
        if (d != null && !d.waveOrder().isNatural()) {
            Comparator<String> order = waveOrder(v.dataset());
            v = new ConsoleReads.FindingView(v.findingId(), v.runId(), v.dataset(), v.wave(), v.againstWave(),
                    v.finding(), v.alert(), v.history(), v.trend().stream()
                    .sorted(Comparator.comparing(ConsoleReads.TrendPoint::wave, order)).toList());
        }
        return html(200, Pages.finding(chrome, v, store.caseLists().forFinding(v.findingId()).orElse(null)));
    }

    private Reply wave(Request request, Fields query, Session session, Chrome chrome) {
        return waveView(query, chrome).map(v -> html(200, Pages.wave(chrome, v, null, v.leadFinding())))
                .orElseGet(() -> html(404, Pages.problem(chrome, 404, "There is no such wave with results.")));
    }

    private Optional<ConsoleReads.WaveView> waveView(Fields fields, Chrome chrome) {
        return reads.wave(required(fields, "dataset"), required(fields, "wave"));
    }

    private Reply search(Request request, Fields query, Session session, Chrome chrome) {
        String q = text(query.getValue("q"), MAX_SEARCH, "q");
        List<ConsoleReads.SearchHit> hits = q == null ? List.of() : reads.search(q, SEARCH_LIMIT);
        return html(200, Pages.search(chrome, q == null ? "" : q, hits));
    }

    /**
     * A wave's {@code findings.json} or {@code digest.md}, made again from its stored current run by the writers the
     * run itself uses, so the download is the file the run wrote beside its findings.
     */
    private Reply download(Request request, Fields query, Session session, Chrome chrome) throws Exception {
        String file = choice(query, "file", List.of("findings.json", "digest.md", "releases.json", "releases.md"));
        if (file == null) {
            throw new BadRequest("file: expected one of findings.json, digest.md, releases.json, releases.md");
        }
        Optional<ConsoleReads.WaveView> v = waveView(query, chrome);
        if (file.startsWith("releases.")) {
            return releaseDownload(v, file, chrome);
        }
        Optional<FindingsReport> report = v.filter(w -> w.runId() != 0).flatMap(w -> store.storedReport(w.runId()));
        if (report.isEmpty()) {
            return html(404, Pages.problem(chrome, 404, "That wave has no judged run to download."));
        }
        FindingsReport r = report.get();
        boolean json = file.equals("findings.json");
        String body = json
                ? Json.mapper().writer().with(SerializationFeature.INDENT_OUTPUT).writeValueAsString(r) + "\n"
                : MarkdownDigest.render(List.of(r));
        // The name is made by the output folder's rules, so a label never reaches the header as it is.
        String name = OutputPaths.name(r.dataset()) + "_" + OutputPaths.name(r.wave()) + "_" + file;
        return Reply.of(200, json ? "application/json; charset=utf-8" : "text/markdown; charset=utf-8", body)
                .with("Content-Disposition", "attachment; filename=\"" + name + "\"");
    }

    /**
     * A finding's case list as the CSV file the run wrote beside its findings, made again from the stored list by
     * the same writer; 404 for a finding without a list.
     */
    private Reply cases(Request request, Fields query, Session session, Chrome chrome) {
        long id = id(query.getValue("finding"), "finding");
        Optional<org.wavewarden.store.CaseLists.CaseList> list = store.caseLists().forFinding(id);
        if (list.isEmpty()) {
            return html(404, Pages.problem(chrome, 404, "Finding " + id + " has no case list."));
        }
        // The file name is made of the finding id and safe characters of the variable only.
        String name = list.get().fileName().substring("cases/".length());
        return Reply.of(200, "text/csv; charset=utf-8", org.wavewarden.deliver.CaseListCsv.render(list.get()))
                .with("Content-Disposition", "attachment; filename=\"" + name + "\"");
    }

    /**
     * The wave's latest release comparison as stored when it was made: {@code releases.md} byte for byte as written,
     * {@code releases.json} with the same content (PostgreSQL keeps it as jsonb, so it is laid out again here).
     */
    private Reply releaseDownload(Optional<ConsoleReads.WaveView> v, String file, Chrome chrome) throws Exception {
        Optional<ReleaseComparisons.Stored> latest = v.flatMap(w -> w.releaseComparisons().stream().findFirst());
        if (latest.isEmpty()) {
            return html(404, Pages.problem(chrome, 404, "That wave has no release comparison to download."));
        }
        ReleaseComparisons.Stored c = latest.get();
        boolean json = file.equals("releases.json");
        String body = json ? Json.mapper().writer().with(SerializationFeature.INDENT_OUTPUT)
                .writeValueAsString(Json.mapper().readTree(c.reportJson())) + "\n" : c.markdown();
        String name = OutputPaths.name(c.dataset()) + "_" + OutputPaths.name(c.wave()) + "_" + file;
        return Reply.of(200, json ? "application/json; charset=utf-8" : "text/markdown; charset=utf-8", body)
                .with("Content-Disposition", "attachment; filename=\"" + name + "\"");
    }

    // ---- login and logout -----------------------------------------------------------------------------------

    private Reply loginForm(Request request) {
        String next = query(request).getValue("next");
        return loginPage(200, null, safeNext(next));
    }

    private Reply loginPage(int status, String error, String next) {
        ConsoleAuth.LoginForm form = auth.loginForm();
        return html(status, Pages.login(form.token(), error, next)).with("Set-Cookie", form.setCookie());
    }

    private Reply login(Request request) {
        Fields form = form(request);
        String next = safeNext(form.getValue("next"));
        if (!auth.loginFormValid(cookies(request), form.getValue("csrf"))) {
            return html(403, Pages.problem(new Chrome(null, null, null, null), 403, CSRF_REFUSAL));
        }
        String name = Objects.requireNonNullElse(form.getValue("name"), "").strip();
        char[] password = Objects.requireNonNullElse(form.getValue("password"), "").toCharArray();
        String from = Request.getRemoteAddr(request);
        ConsoleAuth.LoginResult result;
        try {
            result = auth.login(name, password, from);
        } finally {
            Arrays.fill(password, '\0');
        }
        if (result instanceof ConsoleAuth.LoginResult.LoggedIn in) {
            // Whoever was logged in on this browser before is logged out: a shared browser hands on no session.
            session(request).filter(old -> !old.id().equals(in.session().id())).ifPresent(auth::logout);
            return redirect(next).with("Set-Cookie", auth.setCookie(in.session()));
        }
        if (result instanceof ConsoleAuth.LoginResult.Throttled t) {
            long seconds = Math.max(1, (t.retryAfter().toMillis() + 999) / 1000);
            return loginPage(429, "Too many failed logins: try again in " + minutes(seconds) + ".", next)
                    .with("Retry-After", String.valueOf(seconds));
        }
        return loginPage(401, LOGIN_REFUSAL, next);
    }

    private static String minutes(long seconds) {
        long m = (seconds + 59) / 60;
        return m == 1 ? "a minute" : m + " minutes";
    }

    private Reply logout(Request request, Fields form, Session session) {
        auth.logout(session); // which logs it, as it logs logins
        return redirect("/console/login").with("Set-Cookie", auth.clearCookie());
    }

    // ---- actions --------------------------------------------------------------------------------------------

    private Reply explain(Request request, Fields form, Session session) {
        long alert = id(form.getValue("alert"), "alert");
        var done = reviews.explain(alert, session.principal().name(), reason(form), note(form), SOURCE);
        LOG.info("console: {} explained alert {}", DataText.visible(session.principal().name()), done.alertId());
        return backTo(request, alert, "explained");
    }

    private Reply mute(Request request, Fields form, Session session) {
        long alert = id(form.getValue("alert"), "alert");
        String untilWave = text(form.getValue("untilWave"), MAX_TEXT, "untilWave");
        LocalDate untilDate = date(form.getValue("untilDate"));
        reviews.mute(alert, session.principal().name(), untilWave, untilDate, reason(form), note(form), SOURCE);
        LOG.info("console: {} muted alert {}", DataText.visible(session.principal().name()), alert);
        return backTo(request, alert, "muted");
    }

    private Reply unmute(Request request, Fields form, Session session) {
        long alert = id(form.getValue("alert"), "alert");
        reviews.unmute(alert, session.principal().name(), note(form), SOURCE);
        LOG.info("console: {} unmuted alert {}", DataText.visible(session.principal().name()), alert);
        return backTo(request, alert, "unmuted");
    }

    private Reply signOff(Request request, Fields form, Session session) {
        String dataset = required(form, "dataset");
        String wave = required(form, "wave");
        String release = Objects.requireNonNullElse(text(form.getValue("release"), MAX_TEXT, "release"), "");
        boolean force = flag(form.getValue("force"));
        String reason = text(form.getValue("reason"), MAX_TEXT, "reason");
        Long run = form.getValue("run") == null ? null : id(form.getValue("run"), "run");
        try {
            signOffs.signOff(new SignOffs.Request(dataset, wave, release, session.principal().name(), force, reason,
                    SOURCE, run));
        } catch (ReviewException e) {
            // The wave page again, with the refusal and the alerts that block it beside the form.
            Chrome chrome = new Chrome(session.principal().name(), session.principal().role(), session.csrfToken(),
                    null);
            Optional<ConsoleReads.WaveView> v = reads.wave(dataset, wave);
            return v.isPresent() ? html(409, Pages.wave(chrome, v.get(), e.getMessage(), v.get().leadFinding()))
                    : html(409, Pages.problem(chrome, 409, e.getMessage()));
        }
        LOG.info("console: {} signed off wave {} of {}", DataText.visible(session.principal().name()),
                DataText.visible(wave), DataText.visible(dataset));
        return redirect(wavePath(dataset, wave) + "&done=signedoff");
    }

    /**
     * The page the form came from (its {@code Referer}, when that is a page of this console), else the alert's
     * wave, with the notice's code.
     */
    private Reply backTo(Request request, long alertId, String done) {
        String from = null;
        String referer = request.getHeaders().get(HttpHeader.REFERER);
        if (referer != null) {
            try {
                URI u = URI.create(referer);
                String pathQuery = u.getRawPath() + (u.getRawQuery() == null ? "" : "?" + u.getRawQuery());
                String path = u.getRawPath();
                if (("/console/finding".equals(path) || "/console/wave".equals(path))
                        && CONSOLE_PATH.matcher(pathQuery).matches()) {
                    from = withoutNotice(pathQuery);
                }
            } catch (IllegalArgumentException e) {
                from = null;
            }
        }
        if (from == null) {
            from = reviews.get(alertId).map(a -> wavePath(a.dataset(), a.wave())).orElse("/console");
        }
        return redirect(from + (from.contains("?") ? "&" : "?") + "done=" + done);
    }

    private static String withoutNotice(String pathQuery) {
        int q = pathQuery.indexOf('?');
        if (q < 0) {
            return pathQuery;
        }
        String kept = String.join("&", Arrays.stream(pathQuery.substring(q + 1).split("&"))
                .filter(p -> !p.isEmpty() && !p.startsWith("done=")).toList());
        return pathQuery.substring(0, q) + (kept.isEmpty() ? "" : "?" + kept);
    }

    // ---- reading requests -----------------------------------------------------------------------------------

    /** A positive id as digits only; anything else is a 400 naming the field. */
    static long id(String text, String field) {
        if (text == null || !ID.matcher(text).matches()) {
            throw new BadRequest(field + ": expected a positive whole number");
        }
        return Long.parseLong(text);
    }

    /**
     * A dataset or wave label exactly as given: labels are data and may carry blanks at either end, so nothing is
     * stripped; a control character (which PostgreSQL's text refuses, NUL first of all) is a 400.
     */
    private static String required(Fields fields, String name) {
        String v = fields.getValue(name);
        if (v == null || v.isEmpty()) {
            throw new BadRequest(name + ": a value is needed");
        }
        if (v.length() > MAX_TEXT) {
            throw new BadRequest(name + ": longer than " + MAX_TEXT + " characters");
        }
        return noControlCharacters(v, name);
    }

    private static String noControlCharacters(String v, String name) {
        if (v.chars().anyMatch(c -> c < 0x20 && c != '\t' && c != '\n' && c != '\r' || c == 0x7f)) {
            throw new BadRequest(name + ": contains a control character");
        }
        return v;
    }

    /** The value when it is one of {@code choices}, null when absent or empty, else a 400 listing the choices. */
    private static String choice(Fields fields, String name, List<String> choices) {
        String v = fields.getValue(name);
        if (v == null || v.isBlank()) {
            return null;
        }
        if (!choices.contains(v.strip())) {
            throw new BadRequest(name + ": expected one of " + String.join(", ", choices));
        }
        return v.strip();
    }

    /** Stripped text, null when absent or blank, a 400 when longer than {@code max}. */
    private static String text(String value, int max, String name) {
        if (value == null || value.isBlank()) {
            return null;
        }
        String v = value.strip();
        if (v.length() > max) {
            throw new BadRequest(name + ": longer than " + max + " characters");
        }
        return noControlCharacters(v, name);
    }

    private static ReviewReason reason(Fields form) {
        String r = form.getValue("reason");
        if (r == null || r.isBlank()) {
            return null; // the lifecycle says whether the action needs one, in its own words
        }
        return ReviewReason.parse(r).orElseThrow(() -> new BadRequest("reason: expected one of "
                + ReviewReason.keys()));
    }

    private static String note(Fields form) {
        return text(form.getValue("note"), MAX_TEXT, "note");
    }

    private static LocalDate date(String value) {
        if (value == null || value.isBlank()) {
            return null;
        }
        try {
            return LocalDate.parse(value.strip());
        } catch (DateTimeParseException e) {
            throw new BadRequest("untilDate: expected a day as YYYY-MM-DD");
        }
    }

    private static boolean flag(String value) {
        return value != null && List.of("on", "true", "yes", "1").contains(value.strip().toLowerCase(
                java.util.Locale.ROOT));
    }

    /**
     * Where a login may go on to: a path of this console (no scheme, no host, no {@code //}), else the overview.
     * Anything else would make the login page a redirect to another site.
     */
    static String safeNext(String next) {
        if (next == null || next.contains("//") || next.contains("\\") || !CONSOLE_PATH.matcher(next).matches()
                || next.startsWith("/console/login") || next.startsWith("/console/logout")) {
            return "/console";
        }
        return next;
    }

    // ---- replies and helpers ----------------------------------------------------------------------------------

    private static Reply html(int status, String page) {
        return Reply.of(status, "text/html; charset=utf-8", page);
    }

    private static Reply redirect(String location) {
        return Reply.text(303, "see " + location + "\n").with("Location", location);
    }

    static String encode(String value) {
        return Pages.q(value);
    }

    private static String wavePath(String dataset, String wave) {
        return "/console/wave?dataset=" + encode(dataset) + "&wave=" + encode(wave);
    }

    private DatasetConfig dataset(String name) {
        return config.datasets().stream().filter(d -> d.name().equals(name)).findFirst().orElse(null);
    }

    /**
     * Numbers in numeric order before other labels in text order: the configured natural order for labels that are
     * all numbers or all text, and a total order when a history mixes them.
     */
    static final Comparator<String> NATURAL_WAVES = (a, b) -> {
        BigDecimal x = number(a);
        BigDecimal y = number(b);
        if (x != null && y != null) {
            int c = x.compareTo(y);
            return c != 0 ? c : a.compareTo(b);
        }
        if (x != null || y != null) {
            return x != null ? -1 : 1;
        }
        return a.compareTo(b);
    };

    private static BigDecimal number(String label) {
        return label != null && label.matches("-?\\d+(\\.\\d+)?") ? new BigDecimal(label) : null;
    }

    /** The dataset's configured wave order: its explicit list (unlisted waves after, by label) or natural. */
    Comparator<String> waveOrder(String dataset) {
        DatasetConfig d = dataset(dataset);
        if (d == null || d.waveOrder().isNatural()) {
            return NATURAL_WAVES;
        }
        List<String> explicit = d.waveOrder().explicit();
        return Comparator.<String>comparingInt(w -> {
            int i = explicit.indexOf(w);
            return i < 0 ? Integer.MAX_VALUE : i;
        }).thenComparing(NATURAL_WAVES);
    }
}
