package org.wavewarden.config;

import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.JsonStreamContext;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;
import org.quartz.CronExpression;
import org.wavewarden.review.ReviewReason;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;

/**
 * Reads and validates a YAML configuration before anything runs.
 *
 * <p>The tree is walked by hand rather than bound by reflection so that every problem names its key path
 * ({@code datasets[0].variables[2].threshold}), unknown keys come with the nearest known key as a suggestion, and
 * the whole file is checked up front. Checks that need the database (tables and columns exist) are in
 * {@link CatalogCheck}.
 */
public final class ConfigLoader {

    // Without strict detection a key given twice silently keeps its last value, so a config could say two things.
    private static final ObjectMapper YAML = new ObjectMapper(new YAMLFactory())
            .enable(JsonParser.Feature.STRICT_DUPLICATE_DETECTION);

    private ConfigLoader() {
    }

    public static WardenConfig load(Path file) {
        String text;
        try {
            text = Files.readString(file);
        } catch (IOException e) {
            throw new ConfigException("(file)", "cannot read " + file + ": " + e.getMessage());
        }
        return parse(text);
    }

    public static WardenConfig parse(String yaml) {
        JsonNode root;
        try {
            root = YAML.readTree(yaml);
        } catch (JsonProcessingException e) {
            duplicateKey(e);
            String where = e.getLocation() == null ? "" : " at line " + e.getLocation().getLineNr();
            String first = String.valueOf(e.getOriginalMessage()).lines().findFirst().orElse("").strip();
            throw new ConfigException("(file)", "not valid YAML" + where + ": " + first);
        }
        if (root == null || !root.isObject()) {
            throw new ConfigException("(file)", "expected a mapping with keys source, datasets, ... at the top");
        }
        return new ConfigLoader.Walker().config((ObjectNode) root);
    }

    /** A key given twice in one mapping: refused at its key path, with the line of the second occurrence. */
    private static void duplicateKey(JsonProcessingException e) {
        String message = String.valueOf(e.getOriginalMessage());
        if (!(e.getProcessor() instanceof JsonParser parser) || !message.startsWith("Duplicate field")) {
            return;
        }
        String line = e.getLocation() == null ? "" : " (line " + e.getLocation().getLineNr() + ")";
        throw new ConfigException(keyPath(parser.getParsingContext()), "the key is given twice in the same"
                + " mapping" + line + "; give it once");
    }

    /** The key path of a parsing context in the form ConfigException uses: {@code datasets[0].variables[2]}. */
    private static String keyPath(JsonStreamContext context) {
        java.util.Deque<String> parts = new java.util.ArrayDeque<>();
        for (JsonStreamContext c = context; c != null && !c.inRoot(); c = c.getParent()) {
            parts.push(c.inArray() ? "[" + c.getCurrentIndex() + "]" : "." + c.getCurrentName());
        }
        String path = String.join("", parts);
        return path.startsWith(".") ? path.substring(1) : path;
    }

    /** Walks the tree; each method gets the node and its path. */
    private static final class Walker {

        WardenConfig config(ObjectNode root) {
            known(root, "", "source", "results", "alpha", "fdr", "datasets", "daemon", "console");
            ConnectionConfig source = connection(object(root, "source", "source", true), "source", true);
            WardenConfig.ResultsConfig results = results(object(root, "results", "results", false));
            double alpha = number(root, "alpha", "alpha", 0.05);
            if (!(alpha > 0 && alpha < 1)) {
                throw new ConfigException("alpha", "expected a number strictly between 0 and 1 but got " + alpha);
            }
            WardenConfig.FdrMethod fdr = fdr(root);
            JsonNode ds = root.get("datasets");
            if (ds == null || !ds.isArray() || ds.isEmpty()) {
                throw new ConfigException("datasets", "expected a list with at least one dataset");
            }
            List<DatasetConfig> datasets = new ArrayList<>();
            Set<String> names = new HashSet<>();
            for (int i = 0; i < ds.size(); i++) {
                String path = "datasets[" + i + "]";
                DatasetConfig d = dataset(asObject(ds.get(i), path), path);
                if (!names.add(d.name())) {
                    throw new ConfigException(path + ".name", "dataset name '" + d.name() + "' is used twice");
                }
                datasets.add(d);
            }
            return new WardenConfig(source, results, alpha, fdr, datasets,
                    daemon(object(root, "daemon", "daemon", false)),
                    console(object(root, "console", "console", false)));
        }

        ConsoleConfig console(ObjectNode node) {
            ConsoleConfig d = ConsoleConfig.DISABLED;
            if (node == null) {
                return d;
            }
            known(node, "console", "enabled", "users", "proxy", "sessionMinutes", "idleMinutes", "secureCookie",
                    "loginFailures", "lockoutMinutes");
            boolean enabled = flag(node, "enabled", "console.enabled", false);
            List<ConsoleConfig.User> users = consoleUsers(node);
            ConsoleConfig.Proxy proxy = consoleProxy(object(node, "proxy", "console.proxy", false));
            if (enabled && users.isEmpty()) {
                throw new ConfigException("console.users", "missing: an enabled console needs at least one user");
            }
            if (proxy == null) {
                for (int i = 0; i < users.size(); i++) {
                    ConsoleConfig.User u = users.get(i);
                    if (u.passwordHash() == null && u.passwordHashEnv() == null) {
                        throw new ConfigException("console.users[" + i + "]", "give passwordHash or passwordHashEnv;"
                                + " only a console behind a trusted proxy (console.proxy) has people without one");
                    }
                }
            }
            int session = wholeNumber(node, "sessionMinutes", "console.sessionMinutes",
                    d.sessionLength().toMinutes(), 1, 7 * 24 * 60);
            int idle = wholeNumber(node, "idleMinutes", "console.idleMinutes", d.idleTimeout().toMinutes(), 1,
                    7 * 24 * 60);
            if (idle > session) {
                throw new ConfigException("console.idleMinutes", "expected at most sessionMinutes (" + session
                        + "): a session never lives longer than sessionMinutes, idle or not");
            }
            boolean secure = flag(node, "secureCookie", "console.secureCookie", d.secureCookie());
            int failures = wholeNumber(node, "loginFailures", "console.loginFailures", d.loginFailures(), 1, 1000);
            int lockout = wholeNumber(node, "lockoutMinutes", "console.lockoutMinutes", d.lockout().toMinutes(), 1,
                    24 * 60);
            return new ConsoleConfig(enabled, users, proxy, java.time.Duration.ofMinutes(session),
                    java.time.Duration.ofMinutes(idle), secure, failures, java.time.Duration.ofMinutes(lockout));
        }

        // Names appear on pages, in the audit rows and in log lines: letters, digits and a few marks, no spaces at
        // either end, at most 64 characters.
        private static final java.util.regex.Pattern PERSON =
                java.util.regex.Pattern.compile("[\\p{L}\\p{N}]([\\p{L}\\p{N} ._@'-]{0,62}[\\p{L}\\p{N}])?");

        List<ConsoleConfig.User> consoleUsers(ObjectNode node) {
            JsonNode list = node.get("users");
            if (list == null || list.isNull()) {
                return List.of();
            }
            if (!list.isArray()) {
                throw new ConfigException("console.users", "expected a list but got " + describe(list));
            }
            List<ConsoleConfig.User> users = new ArrayList<>();
            Map<String, Integer> seen = new HashMap<>();
            for (int i = 0; i < list.size(); i++) {
                String path = "console.users[" + i + "]";
                ObjectNode u = asObject(list.get(i), path);
                if (u.has("password")) {
                    // Refused before anything else, and without repeating the value.
                    throw new ConfigException(path + ".password", "passwords are never written in the config; give"
                            + " passwordHash, the output of wavewarden console-password");
                }
                known(u, path, "name", "role", "passwordHash", "passwordHashEnv");
                String name = text(u, "name", path + ".name", true);
                if (!PERSON.matcher(name).matches()) {
                    throw new ConfigException(path + ".name", "expected 1 to 64 letters, digits, spaces and . _ @ ' -,"
                            + " starting and ending with a letter or digit, but got " + Identifiers.Text.show(name));
                }
                Integer first = seen.putIfAbsent(name, i);
                if (first != null) {
                    throw new ConfigException(path + ".name", "user name '" + name + "' is already given at"
                            + " console.users[" + first + "]");
                }
                String roleText = text(u, "role", path + ".role", true);
                org.wavewarden.review.Role role = java.util.Arrays.stream(org.wavewarden.review.Role.values())
                        .filter(r -> r.key().equals(roleText)).findFirst().orElseThrow(() -> new ConfigException(
                                path + ".role", "expected one of viewer, steward, releaser but got "
                                + Identifiers.Text.show(roleText)));
                String hash = text(u, "passwordHash", path + ".passwordHash", false);
                String env = envName(u, "passwordHashEnv", path);
                if (hash != null && env != null) {
                    throw new ConfigException(path + ".passwordHashEnv", "give passwordHash or passwordHashEnv,"
                            + " not both");
                }
                if (hash != null) {
                    hash = hash.strip();
                    String problem = org.wavewarden.console.auth.PasswordHashes.problem(hash);
                    if (problem != null) {
                        throw new ConfigException(path + ".passwordHash", "the value " + problem);
                    }
                }
                users.add(new ConsoleConfig.User(name, role, hash, env));
            }
            return users;
        }

        ConsoleConfig.Proxy consoleProxy(ObjectNode node) {
            if (node == null) {
                return null;
            }
            known(node, "console.proxy", "userHeader", "trustedAddresses");
            String header = text(node, "userHeader", "console.proxy.userHeader", true);
            // An HTTP field name (a token of RFC 9110 section 5.1), so that it can only ever name a header.
            if (!header.matches("[A-Za-z0-9!#$%&'*+.^_`|~-]{1,100}")) {
                throw new ConfigException("console.proxy.userHeader", "expected an HTTP header name such as"
                        + " X-Forwarded-User but got " + Identifiers.Text.show(header));
            }
            List<String> addresses = texts(node, "trustedAddresses", "console.proxy.trustedAddresses");
            if (addresses.isEmpty()) {
                throw new ConfigException("console.proxy.trustedAddresses", "missing: expected the proxy's IP"
                        + " addresses (such as 127.0.0.1); the header is believed from these only");
            }
            for (int i = 0; i < addresses.size(); i++) {
                if (org.wavewarden.console.auth.IpLiteral.parse(addresses.get(i)).isEmpty()) {
                    throw new ConfigException("console.proxy.trustedAddresses[" + i + "]", "expected an IPv4 or IPv6"
                            + " address (no host name, no range) but got " + Identifiers.Text.show(addresses.get(i)));
                }
            }
            return new ConsoleConfig.Proxy(header, addresses);
        }

        boolean flag(ObjectNode parent, String key, String path, boolean dflt) {
            JsonNode n = parent.get(key);
            if (n == null || n.isNull()) {
                return dflt;
            }
            if (!n.isBoolean()) {
                throw new ConfigException(path, "expected true or false but got " + describe(n));
            }
            return n.asBoolean();
        }

        int wholeNumber(ObjectNode parent, String key, String path, long dflt, int min, int max) {
            double v = number(parent, key, path, dflt);
            if (v != Math.rint(v) || v < min || v > max) {
                throw new ConfigException(path, "expected a whole number from " + min + " to " + max + " but got "
                        + parent.get(key).asText());
            }
            return (int) v;
        }

        DaemonConfig daemon(ObjectNode node) {
            if (node == null) {
                return DaemonConfig.DEFAULTS;
            }
            known(node, "daemon", "httpBind", "httpPort", "outputDir", "clusterCheckinMillis", "redeliverSeconds");
            String bind = text(node, "httpBind", "daemon.httpBind", false);
            if (bind != null && !bind.matches("[0-9A-Za-z.:\\-\\[\\]]{1,255}")) {
                throw new ConfigException("daemon.httpBind", "expected a host name or IP address but got "
                        + Identifiers.Text.show(bind));
            }
            double port = number(node, "httpPort", "daemon.httpPort", DaemonConfig.DEFAULTS.httpPort());
            if (port != Math.rint(port) || port < -1 || port > 65535) {
                throw new ConfigException("daemon.httpPort", "expected a port from 0 to 65535, or -1 for none, but got "
                        + node.get("httpPort").asText());
            }
            String dir = text(node, "outputDir", "daemon.outputDir", false);
            double checkin = number(node, "clusterCheckinMillis", "daemon.clusterCheckinMillis",
                    DaemonConfig.DEFAULTS.clusterCheckinMillis());
            if (checkin != Math.rint(checkin) || checkin < 100 || checkin > 600_000) {
                throw new ConfigException("daemon.clusterCheckinMillis", "expected milliseconds from 100 to 600000");
            }
            double redeliver = number(node, "redeliverSeconds", "daemon.redeliverSeconds",
                    DaemonConfig.DEFAULTS.redeliverSeconds());
            if (redeliver != Math.rint(redeliver) || redeliver < 0 || redeliver > 86_400) {
                throw new ConfigException("daemon.redeliverSeconds", "expected whole seconds from 1 to 86400, or 0"
                        + " for never, but got " + node.get("redeliverSeconds").asText());
            }
            return new DaemonConfig(bind == null ? DaemonConfig.DEFAULTS.httpBind() : bind, (int) port,
                    dir == null ? DaemonConfig.DEFAULTS.outputDir() : dir, (int) checkin, (int) redeliver);
        }

        SinkSettings alerts(ObjectNode node, String path) {
            if (node == null) {
                return SinkSettings.NONE;
            }
            known(node, path, "jsonLines", "webhook", "email", "digestBaseUrl");
            SinkSettings.JsonLines jl = null;
            SinkSettings.Webhook wh = null;
            ObjectNode j = object(node, "jsonLines", path + ".jsonLines", false);
            if (j != null) {
                known(j, path + ".jsonLines", "path", "minimumVerdict", "kinds");
                jl = new SinkSettings.JsonLines(text(j, "path", path + ".jsonLines.path", true),
                        filter(j, path + ".jsonLines"));
            }
            ObjectNode w = object(node, "webhook", path + ".webhook", false);
            if (w != null) {
                String wp = path + ".webhook";
                known(w, wp, "url", "secretEnv", "minimumVerdict", "kinds", "secret", "messages", "textField");
                if (w.has("secret")) {
                    throw new ConfigException(wp + ".secret", "secrets are never written in the config;"
                            + " name an environment variable with secretEnv");
                }
                String url = text(w, "url", wp + ".url", true);
                if (!url.matches("https?://[^\\s]+")) {
                    throw new ConfigException(wp + ".url", "expected an http:// or https:// URL but got "
                            + Identifiers.Text.show(url));
                }
                String env = text(w, "secretEnv", wp + ".secretEnv", true);
                if (!env.matches("[A-Za-z_][A-Za-z0-9_]*")) {
                    throw new ConfigException(wp + ".secretEnv", "expected an environment variable name");
                }
                String field = text(w, "textField", wp + ".textField", false);
                if (field != null && !field.matches("[A-Za-z_][A-Za-z0-9_]{0,63}")) {
                    throw new ConfigException(wp + ".textField", "expected a JSON field name of letters, digits"
                            + " and '_' (such as text) but got " + Identifiers.Text.show(field));
                }
                wh = new SinkSettings.Webhook(url, env, filter(w, wp),
                        messages(w, wp, SinkSettings.Messages.PER_ALERT), field);
            }
            SinkSettings.Email em = email(object(node, "email", path + ".email", false), path + ".email");
            String base = text(node, "digestBaseUrl", path + ".digestBaseUrl", false);
            if (base != null) {
                if (!base.matches("https?://[^\\s?#]+")) {
                    throw new ConfigException(path + ".digestBaseUrl", "expected an http:// or https:// URL without"
                            + " query or fragment but got " + Identifiers.Text.show(base));
                }
                base = base.replaceAll("/+$", "");
            }
            return new SinkSettings(jl, wh, em, base);
        }

        SinkSettings.Messages messages(ObjectNode node, String path, SinkSettings.Messages dflt) {
            String m = text(node, "messages", path + ".messages", false);
            if (m == null) {
                return dflt;
            }
            SinkSettings.Messages out = SinkSettings.Messages.of(m);
            if (out == null) {
                throw new ConfigException(path + ".messages", "expected perAlert, perFiring or both but got "
                        + Identifiers.Text.show(m));
            }
            return out;
        }

        SinkSettings.Email email(ObjectNode e, String path) {
            if (e == null) {
                return null;
            }
            known(e, path, "host", "port", "tls", "caFile", "userEnv", "passwordEnv", "password", "from", "to",
                    "minimumVerdict", "kinds", "messages");
            if (e.has("password")) {
                throw new ConfigException(path + ".password", "passwords are never written in the config; name an"
                        + " environment variable with passwordEnv");
            }
            String host = text(e, "host", path + ".host", true);
            if (!host.matches("[0-9A-Za-z.:\\-\\[\\]]{1,255}")) {
                throw new ConfigException(path + ".host", "expected a host name or IP address but got "
                        + Identifiers.Text.show(host));
            }
            double port = number(e, "port", path + ".port", 587);
            if (port != Math.rint(port) || port < 1 || port > 65535) {
                throw new ConfigException(path + ".port", "expected a port from 1 to 65535 but got "
                        + e.get("port").asText());
            }
            String tlsText = text(e, "tls", path + ".tls", false);
            SinkSettings.Tls tls;
            if (tlsText == null || tlsText.equals("starttls")) {
                tls = SinkSettings.Tls.STARTTLS;
            } else if (tlsText.equals("none")) {
                tls = SinkSettings.Tls.NONE;
                // Credentials and alerts in clear text are acceptable only to a relay on this very machine.
                if (!(host.equals("localhost") || host.startsWith("127.") || host.equals("::1")
                        || host.equals("[::1]"))) {
                    throw new ConfigException(path + ".tls", "none is only for a relay on the loopback interface"
                            + " (localhost, 127.0.0.1 or ::1); " + Identifiers.Text.show(host) + " needs starttls");
                }
            } else {
                throw new ConfigException(path + ".tls", "expected starttls or none but got "
                        + Identifiers.Text.show(tlsText));
            }
            String ca = text(e, "caFile", path + ".caFile", false);
            if (ca != null && tls == SinkSettings.Tls.NONE) {
                throw new ConfigException(path + ".caFile", "only meaningful with tls: starttls");
            }
            String userEnv = envName(e, "userEnv", path);
            String passwordEnv = envName(e, "passwordEnv", path);
            if ((userEnv == null) != (passwordEnv == null)) {
                throw new ConfigException(path + (userEnv == null ? ".userEnv" : ".passwordEnv"), "give both userEnv"
                        + " and passwordEnv, or neither for a relay that takes mail without authentication");
            }
            String from = address(text(e, "from", path + ".from", true), path + ".from");
            JsonNode toNode = e.get("to");
            List<String> to = toNode != null && toNode.isTextual() ? List.of(toNode.asText())
                    : texts(e, "to", path + ".to");
            if (to.isEmpty()) {
                throw new ConfigException(path + ".to", "missing: expected at least one recipient address");
            }
            List<String> checked = new ArrayList<>();
            for (int i = 0; i < to.size(); i++) {
                checked.add(address(to.get(i), toNode.isTextual() ? path + ".to" : path + ".to[" + i + "]"));
            }
            return new SinkSettings.Email(host, (int) port, tls, ca, userEnv, passwordEnv, from, checked,
                    filter(e, path), messages(e, path, SinkSettings.Messages.PER_FIRING));
        }

        String envName(ObjectNode node, String key, String path) {
            String env = text(node, key, path + "." + key, false);
            if (env != null && !env.matches("[A-Za-z_][A-Za-z0-9_]*")) {
                throw new ConfigException(path + "." + key, "expected an environment variable name but got "
                        + Identifiers.Text.show(env));
            }
            return env;
        }

        /** A bare address (local@domain, RFC 5322 addr-spec without a display name), checked strictly. */
        static String address(String text, String path) {
            try {
                jakarta.mail.internet.InternetAddress a = new jakarta.mail.internet.InternetAddress(text, true);
                a.validate();
                if (!a.getAddress().equals(text) || !text.matches("[^@\\s]+@[^@\\s]+\\.[^@\\s]+")) {
                    throw new jakarta.mail.internet.AddressException("not a bare address");
                }
                return text;
            } catch (jakarta.mail.internet.AddressException ex) {
                throw new ConfigException(path, "expected an e-mail address such as survey-ops@harrowmere.example"
                        + " but got " + Identifiers.Text.show(text));
            }
        }

        SinkSettings.Filter filter(ObjectNode node, String path) {
            String min = text(node, "minimumVerdict", path + ".minimumVerdict", false);
            if (min != null && !java.util.Set.of("MATERIAL", "MINOR", "UNCERTAIN", "STABLE").contains(min)) {
                throw new ConfigException(path + ".minimumVerdict", "expected MATERIAL, UNCERTAIN, MINOR or STABLE but"
                        + " got '" + min + "'");
            }
            List<String> kinds = texts(node, "kinds", path + ".kinds");
            for (int i = 0; i < kinds.size(); i++) {
                try {
                    org.wavewarden.judge.FindingKind.valueOf(kinds.get(i));
                } catch (IllegalArgumentException e) {
                    throw new ConfigException(path + ".kinds[" + i + "]", "unknown finding kind '" + kinds.get(i) + "'"
                            + Suggest.nearest(kinds.get(i), java.util.Arrays.stream(
                                    org.wavewarden.judge.FindingKind.values()).map(Enum::name).toList())
                            .map(x -> "; did you mean '" + x + "'?").orElse(""));
                }
            }
            return new SinkSettings.Filter(min, new java.util.LinkedHashSet<>(kinds));
        }

        java.time.Duration duration(ObjectNode node, String key, String path) {
            String text = text(node, key, path, false);
            if (text == null) {
                return java.time.Duration.ZERO;
            }
            try {
                java.time.Duration d = java.time.Duration.parse(text);
                if (d.isNegative()) {
                    throw new ConfigException(path, "expected a duration that is not negative");
                }
                return d;
            } catch (java.time.format.DateTimeParseException e) {
                throw new ConfigException(path, "expected an ISO-8601 duration such as PT10M or PT1H but got '" + text
                        + "'");
            }
        }

        WardenConfig.FdrMethod fdr(ObjectNode root) {
            String fdr = text(root, "fdr", "fdr", false);
            if (fdr == null || fdr.equals("benjamini-hochberg")) {
                return WardenConfig.FdrMethod.BENJAMINI_HOCHBERG;
            }
            if (fdr.equals("benjamini-yekutieli")) {
                return WardenConfig.FdrMethod.BENJAMINI_YEKUTIELI;
            }
            throw new ConfigException("fdr", "expected benjamini-hochberg or benjamini-yekutieli but got '" + fdr + "'");
        }

        ConnectionConfig connection(ObjectNode node, String path, boolean required) {
            if (node == null) {
                if (required) {
                    throw new ConfigException(path, "missing: expected jdbcUrl, user and passwordEnv or passwordFile");
                }
                return null;
            }
            known(node, path, "jdbcUrl", "user", "passwordEnv", "passwordFile", "password");
            if (node.has("password")) {
                throw new ConfigException(path + ".password", "passwords are never written in the config; name an"
                        + " environment variable with passwordEnv or a file with passwordFile");
            }
            String url = text(node, "jdbcUrl", path + ".jdbcUrl", true);
            if (!url.equals(ConnectionConfig.EMBEDDED)) {
                JdbcUrl.check(path + ".jdbcUrl", url);
            }
            String user = text(node, "user", path + ".user", !url.equals(ConnectionConfig.EMBEDDED));
            String env = text(node, "passwordEnv", path + ".passwordEnv", false);
            String file = text(node, "passwordFile", path + ".passwordFile", false);
            if (env != null && file != null) {
                throw new ConfigException(path + ".passwordEnv", "give either passwordEnv or passwordFile, not both");
            }
            if (env != null && !env.matches("[A-Za-z_][A-Za-z0-9_]*")) {
                throw new ConfigException(path + ".passwordEnv", "expected an environment variable name but got "
                        + Identifiers.Text.show(env));
            }
            return new ConnectionConfig(url, user, env, file);
        }

        WardenConfig.ResultsConfig results(ObjectNode node) {
            if (node == null) {
                return new WardenConfig.ResultsConfig(null, "wavewarden");
            }
            known(node, "results", "jdbcUrl", "user", "passwordEnv", "passwordFile", "password", "schema");
            String schema = text(node, "schema", "results.schema", false);
            schema = schema == null ? "wavewarden" : Identifiers.require("results.schema", schema);
            ConnectionConfig conn = null;
            if (node.has("jdbcUrl")) {
                ObjectNode copy = node.deepCopy();
                copy.remove("schema");
                conn = connection(copy, "results", true);
            } else {
                for (String k : List.of("user", "passwordEnv", "passwordFile", "password")) {
                    if (node.has(k)) {
                        throw new ConfigException("results." + k, "only meaningful with results.jdbcUrl; without it"
                                + " results go to the source server");
                    }
                }
            }
            return new WardenConfig.ResultsConfig(conn, schema);
        }

        DatasetConfig dataset(ObjectNode node, String path) {
            known(node, path, "name", "table", "waveColumn", "tablePattern", "waveOrder", "compareWith", "schedule",
                    "exclude", "variables", "quietPeriod", "alerts", "readyTable", "readyColumn", "weightColumn",
                    "respondentKey", "releases", "design", "relationships", "codebook", "population",
                    "expectedChanges", "mutes", "breakdowns");
            String name = text(node, "name", path + ".name", true);
            if (!name.matches("[A-Za-z0-9][A-Za-z0-9_.-]{0,99}")) {
                throw new ConfigException(path + ".name", "expected letters, digits, '-', '_' or '.' (at most 100)"
                        + " but got " + Identifiers.Text.show(name));
            }
            String table = text(node, "table", path + ".table", false);
            String pattern = text(node, "tablePattern", path + ".tablePattern", false);
            String waveColumn = text(node, "waveColumn", path + ".waveColumn", false);
            if ((table == null) == (pattern == null)) {
                throw new ConfigException(path + ".table", "give either table (with waveColumn) or tablePattern");
            }
            if (table != null) {
                Identifiers.TableName.parse(path + ".table", table);
                if (waveColumn == null) {
                    throw new ConfigException(path + ".waveColumn", "missing: expected the column naming each"
                            + " row's wave");
                }
                Identifiers.require(path + ".waveColumn", waveColumn);
            } else {
                if (!pattern.contains("{wave}")) {
                    throw new ConfigException(path + ".tablePattern", "expected a pattern containing {wave}, such as"
                            + " survey.wave_{wave}");
                }
                Identifiers.TableName.parse(path + ".tablePattern", pattern.replace("{wave}", "w"));
                if (waveColumn != null) {
                    throw new ConfigException(path + ".waveColumn", "not used with tablePattern: the table names"
                            + " the wave");
                }
            }
            String schedule = text(node, "schedule", path + ".schedule", false);
            if (schedule != null && !CronExpression.isValidExpression(schedule)) {
                throw new ConfigException(path + ".schedule", "expected a Quartz cron expression (seconds minutes"
                        + " hours day-of-month month day-of-week), e.g. \"0 15 2 * * ?\", but got '" + schedule + "'");
            }
            if (schedule != null && neverFires(schedule)) {
                throw new ConfigException(path + ".schedule", "the cron expression '" + schedule + "' never fires"
                        + " again (its last time is in the past), so the dataset would never be judged");
            }
            List<String> exclude = texts(node, "exclude", path + ".exclude");
            for (int i = 0; i < exclude.size(); i++) {
                Identifiers.require(path + ".exclude[" + i + "]", exclude.get(i));
            }
            List<VariableConfig> variables = new ArrayList<>();
            JsonNode vs = node.get("variables");
            if (vs != null && !vs.isNull()) {
                if (!vs.isArray()) {
                    throw new ConfigException(path + ".variables", "expected a list of variables");
                }
                Set<String> seen = new HashSet<>();
                for (int i = 0; i < vs.size(); i++) {
                    String vp = path + ".variables[" + i + "]";
                    VariableConfig v = variable(asObject(vs.get(i), vp), vp);
                    if (!seen.add(v.name())) {
                        throw new ConfigException(vp + ".name", "variable '" + v.name() + "' is listed twice");
                    }
                    variables.add(v);
                }
            }
            String key = respondentKey(node, path, waveColumn);
            ReleasesConfig releases = releases(object(node, "releases", path + ".releases", false), path, key,
                    table, pattern, waveColumn);
            WaveOrder order = waveOrder(node, path);
            CompareWith compareWith = compareWith(node.get("compareWith"), path + ".compareWith");
            for (int i = 0; i < compareWith.rules().size(); i++) {
                if (compareWith.rules().get(i) instanceof CompareWith.Baseline b && !order.isNatural()
                        && !order.explicit().contains(b.wave())) {
                    throw new ConfigException(path + ".compareWith" + (compareWith instanceof CompareWith.Alongside
                            ? "[" + i + "]" : "") + ".baseline", "wave '" + b.wave() + "' is not in " + path
                            + ".waveOrder " + order.explicit());
                }
            }
            DatasetConfig d = new DatasetConfig(name, table, waveColumn, pattern, order, compareWith, schedule,
                    exclude, variables, duration(node, "quietPeriod", path + ".quietPeriod"),
                    alerts(object(node, "alerts", path + ".alerts", false), path + ".alerts"),
                    readyTable(node, path), readyColumn(node, path), weightColumn(node, path), key, releases,
                    design(object(node, "design", path + ".design", false), path, waveColumn, key,
                            weightColumn(node, path)),
                    relationships(node.get("relationships"), path + ".relationships"),
                    codebook(object(node, "codebook", path + ".codebook", false), path + ".codebook"),
                    population(node, path + ".population"),
                    new AlertRules(expectedChanges(node.get("expectedChanges"), path + ".expectedChanges", order),
                            mutes(node.get("mutes"), path + ".mutes", order)));
            notBookkeeping(d, path);
            Breakdowns breakdowns = breakdowns(object(node, "breakdowns", path + ".breakdowns", false), d,
                    path + ".breakdowns");
            return breakdowns == null ? d : new DatasetConfig(d.name(), d.table(), d.waveColumn(), d.tablePattern(),
                    d.waveOrder(), d.compareWith(), d.schedule(), d.exclude(), d.variables(), d.quietPeriod(),
                    d.alerts(), d.readyTable(), d.readyColumn(), d.weightColumn(), d.respondentKey(), d.releases(),
                    d.design(), d.relationships(), d.codebook(), d.population(), d.alertRules(), breakdowns);
        }

        /**
         * {@code breakdowns: {columns, maxDomains, interviewer, minInterviews, keyVariables, iccThreshold,
         * maxCases}}: the domain columns flagged variables are broken down by, and the interviewer monitoring. A
         * domain column may be a monitored variable or an excluded identifier, but not the wave, weight, respondent
         * key or release column (bookkeeping whose every value is its own domain, or no domain at all). The
         * interviewer's settings need the interviewer column; key variables must be compared variables, so
         * neither bookkeeping nor the interviewer column itself (that each exists in the table, declared or inferred,
         * is the catalog check's). Null when the section is left out.
         */
        Breakdowns breakdowns(ObjectNode node, DatasetConfig d, String path) {
            if (node == null) {
                return null;
            }
            known(node, path, "columns", "maxDomains", "interviewer", "minInterviews", "keyVariables",
                    "iccThreshold", "maxCases");
            List<String> columns = texts(node, "columns", path + ".columns");
            if (columns.isEmpty()) {
                throw new ConfigException(path + ".columns", "missing: expected the list of domain columns, e.g."
                        + " [district, interview_mode]");
            }
            for (int i = 0; i < columns.size(); i++) {
                String at = path + ".columns[" + i + "]";
                String c = columns.get(i);
                Identifiers.require(at, c);
                int twin = columns.indexOf(c);
                if (twin < i) {
                    throw new ConfigException(at, "'" + c + "' is listed twice (also " + path + ".columns[" + twin
                            + "])");
                }
                String other = c.equals(d.waveColumn()) ? "waveColumn" : c.equals(d.weightColumn()) ? "weightColumn"
                        : c.equals(d.respondentKey()) ? "respondentKey" : c.equals(d.releaseColumn())
                        ? "releases.column" : null;
                if (other != null) {
                    throw new ConfigException(at, "'" + c + "' is the dataset's " + other + " ("
                            + path.substring(0, path.lastIndexOf('.')) + "." + other + "), which is never a domain:"
                            + " break down by the answers or the field work, e.g. a district or an interviewer");
                }
            }
            int maxDomains = node.has("maxDomains") ? wholeNumber(node, "maxDomains", path + ".maxDomains", 1,
                    100_000, "domains") : Breakdowns.DEFAULT_MAX_DOMAINS;
            int maxCases = node.has("maxCases") ? wholeNumber(node, "maxCases", path + ".maxCases", 1, 10_000_000,
                    "cases") : Breakdowns.DEFAULT_MAX_CASES;
            String interviewer = text(node, "interviewer", path + ".interviewer", false);
            if (interviewer == null) {
                for (String k : List.of("minInterviews", "keyVariables", "iccThreshold")) {
                    if (node.has(k)) {
                        throw new ConfigException(path + "." + k, "only meaningful with " + path + ".interviewer,"
                                + " the column naming each interview's interviewer");
                    }
                }
                return new Breakdowns(columns, maxDomains, null, Breakdowns.DEFAULT_MIN_INTERVIEWS, List.of(),
                        Breakdowns.DEFAULT_ICC_THRESHOLD, maxCases);
            }
            if (!columns.contains(interviewer)) {
                throw new ConfigException(path + ".interviewer", "'" + interviewer + "' is not one of " + path
                        + ".columns " + columns + Suggest.nearest(interviewer, columns)
                        .map(x -> "; did you mean '" + x + "'?").orElse("; add it there too, as its workloads are"
                                + " tallied with the domains"));
            }
            // One interview gives no spread within an interviewer, so no interviewer effect can be estimated from it.
            int minInterviews = node.has("minInterviews") ? wholeNumber(node, "minInterviews",
                    path + ".minInterviews", 2, 1_000_000, "interviews") : Breakdowns.DEFAULT_MIN_INTERVIEWS;
            double icc = number(node, "iccThreshold", path + ".iccThreshold", Breakdowns.DEFAULT_ICC_THRESHOLD);
            if (!(icc >= 0 && icc < 1)) {
                throw new ConfigException(path + ".iccThreshold", "expected an intra-interviewer correlation from 0"
                        + " up to (not including) 1, e.g. 0.02, but got " + node.get("iccThreshold").asText());
            }
            List<String> keys = texts(node, "keyVariables", path + ".keyVariables");
            for (int i = 0; i < keys.size(); i++) {
                String at = path + ".keyVariables[" + i + "]";
                String k = keys.get(i);
                Identifiers.require(at, k);
                if (keys.indexOf(k) < i) {
                    throw new ConfigException(at, "'" + k + "' is listed twice (also " + path + ".keyVariables["
                            + keys.indexOf(k) + "])");
                }
                if (k.equals(interviewer) || d.isBookkeeping(k)) {
                    throw new ConfigException(at, "'" + k + "' is " + (k.equals(interviewer) ? "the interviewer"
                            + " column itself" : "a column never compared as a variable (the wave, weight,"
                            + " respondent key, release, design or an excluded column)") + "; key variables are the"
                            + " answers whose per-interviewer distributions are compared");
                }
            }
            return new Breakdowns(columns, maxDomains, interviewer, minInterviews, keys, icc, maxCases);
        }

        /** {@code population: sample | census | register}; a sample when left out. */
        Population population(ObjectNode node, String path) {
            String p = text(node, "population", path, false);
            if (p == null) {
                return Population.SAMPLE;
            }
            List<String> names = java.util.Arrays.stream(Population.values())
                    .map(v -> v.name().toLowerCase(Locale.ROOT)).toList();
            if (!names.contains(p)) {
                throw new ConfigException(path, "expected one of " + String.join(", ", names) + " but got "
                        + Identifiers.Text.show(p) + Suggest.nearest(p, names).map(x -> " (did you mean '" + x + "'?)")
                        .orElse(""));
            }
            return Population.valueOf(p.toUpperCase(Locale.ROOT));
        }

        /**
         * Changes declared ahead: {@code [{variable, waves, reason, note, by}]}, where {@code waves} is one wave
         * label or {@code {from, to}} (both inclusive).
         */
        List<ExpectedChange> expectedChanges(JsonNode node, String path, WaveOrder order) {
            List<ExpectedChange> out = new ArrayList<>();
            for (int i = 0; i < listSize(node, path, "{variable, waves, reason, note, by}"); i++) {
                String p = path + "[" + i + "]";
                ObjectNode o = asObject(node.get(i), p);
                known(o, p, "variable", "waves", "reason", "note", "by");
                String variable = variablePattern(text(o, "variable", p + ".variable", true), p + ".variable");
                JsonNode w = o.get("waves");
                String from;
                String to;
                if (w == null || w.isNull()) {
                    throw new ConfigException(p + ".waves", "missing: expected one wave label, or {from, to} for a"
                            + " range of waves");
                } else if (w.isObject()) {
                    ObjectNode range = (ObjectNode) w;
                    known(range, p + ".waves", "from", "to");
                    from = wave(text(range, "from", p + ".waves.from", true), p + ".waves.from", order);
                    to = wave(text(range, "to", p + ".waves.to", true), p + ".waves.to", order);
                    if (!order.isNatural() && order.explicit().indexOf(from) > order.explicit().indexOf(to)) {
                        throw new ConfigException(p + ".waves.to", "wave '" + to + "' comes before from '" + from
                                + "' in the waveOrder " + order.explicit());
                    }
                } else {
                    from = wave(text(o, "waves", p + ".waves", true), p + ".waves", order);
                    to = from;
                }
                ReviewReason reason = reason(text(o, "reason", p + ".reason", true), p + ".reason");
                out.add(new ExpectedChange(variable, from, to, reason, text(o, "note", p + ".note", false),
                        text(o, "by", p + ".by", true)));
            }
            return out;
        }

        /**
         * Mute rules: {@code [{variable, kind, untilWave, untilDate, reason, by}]}; variable and kind narrow the rule
         * (left out: every variable, every kind), and at least one expiry is required so that no mute is forever.
         */
        List<MuteRule> mutes(JsonNode node, String path, WaveOrder order) {
            List<MuteRule> out = new ArrayList<>();
            for (int i = 0; i < listSize(node, path, "{variable, kind, untilWave, untilDate, reason, by}"); i++) {
                String p = path + "[" + i + "]";
                ObjectNode o = asObject(node.get(i), p);
                known(o, p, "variable", "kind", "untilWave", "untilDate", "reason", "by");
                String variable = text(o, "variable", p + ".variable", false);
                if (variable != null) {
                    variable = variablePattern(variable, p + ".variable");
                }
                String kind = text(o, "kind", p + ".kind", false);
                String untilWave = text(o, "untilWave", p + ".untilWave", false);
                if (untilWave != null) {
                    wave(untilWave, p + ".untilWave", order);
                }
                String untilDate = text(o, "untilDate", p + ".untilDate", false);
                if (untilWave == null && untilDate == null) {
                    throw new ConfigException(p + ".untilWave", "missing: a mute ends at a wave (untilWave), a day"
                            + " (untilDate, such as 2025-06-30) or both, whichever comes first");
                }
                java.time.LocalDate until = null;
                if (untilDate != null) {
                    try {
                        until = java.time.LocalDate.parse(untilDate);
                    } catch (java.time.format.DateTimeParseException e) {
                        throw new ConfigException(p + ".untilDate", "expected an ISO date such as 2025-06-30 but got "
                                + Identifiers.Text.show(untilDate));
                    }
                }
                out.add(new MuteRule(variable, kind == null ? null : findingKind(kind, p + ".kind"), untilWave, until,
                        text(o, "reason", p + ".reason", true), text(o, "by", p + ".by", true)));
            }
            return out;
        }

        /** The size of an optional list of mappings; null is an empty list. */
        int listSize(JsonNode node, String path, String shape) {
            if (node == null || node.isNull()) {
                return 0;
            }
            if (!node.isArray()) {
                throw new ConfigException(path, "expected a list of " + shape + " but got " + describe(node));
            }
            return node.size();
        }

        /** A variable name, or a pattern in which {@code *} stands for any run of characters. */
        String variablePattern(String text, String path) {
            if (text.chars().anyMatch(Character::isISOControl)) {
                throw new ConfigException(path, "expected a variable name or a pattern with * but got text with a"
                        + " control character");
            }
            return text.strip();
        }

        /** A wave label; with an explicit waveOrder it must be one of its waves. */
        String wave(String label, String path, WaveOrder order) {
            if (!order.isNatural() && !order.explicit().contains(label)) {
                throw new ConfigException(path, "wave '" + label + "' is not in the waveOrder " + order.explicit()
                        + Suggest.nearest(label, order.explicit()).map(x -> " (did you mean '" + x + "'?)")
                        .orElse(""));
            }
            return label;
        }

        ReviewReason reason(String text, String path) {
            return ReviewReason.parse(text).orElseThrow(() -> new ConfigException(path, "expected one of "
                    + ReviewReason.keys() + " but got \"" + text + "\""
                    + Suggest.nearest(text, java.util.Arrays.stream(ReviewReason.values()).map(ReviewReason::key)
                    .toList()).map(x -> " (did you mean '" + x + "'?)").orElse("")));
        }

        org.wavewarden.judge.FindingKind findingKind(String text, String path) {
            List<String> names = java.util.Arrays.stream(org.wavewarden.judge.FindingKind.values()).map(Enum::name)
                    .toList();
            if (!names.contains(text)) {
                throw new ConfigException(path, "unknown finding kind " + Identifiers.Text.show(text)
                        + Suggest.nearest(text, names).map(x -> "; did you mean '" + x + "'?")
                        .orElse("; expected one of " + String.join(", ", names)));
            }
            return org.wavewarden.judge.FindingKind.valueOf(text);
        }

        /**
         * A bookkeeping column (wave, weight, design, respondent key, release or excluded column) is never compared,
         * so declaring it as a variable as well would silently drop the declaration: refused, naming both keys.
         */
        void notBookkeeping(DatasetConfig d, String path) {
            for (int i = 0; i < d.variables().size(); i++) {
                String v = d.variables().get(i).name();
                String other = v.equals(d.waveColumn()) ? "waveColumn"
                        : v.equals(d.weightColumn()) ? "weightColumn"
                        : v.equals(d.respondentKey()) ? "respondentKey"
                        : v.equals(d.releaseColumn()) ? "releases.column"
                        : d.design() != null && v.equals(d.design().strata()) ? "design.strata"
                        : d.design() != null && v.equals(d.design().clusters()) ? "design.clusters"
                        : d.exclude().contains(v) ? "exclude[" + d.exclude().indexOf(v) + "]" : null;
                if (other != null) {
                    throw new ConfigException(path + ".variables[" + i + "].name", "'" + v + "' is also "
                            + path + "." + other + ", a column that is never compared as a variable; keep one of the"
                            + " two");
                }
            }
        }

        /**
         * {@code codebook: {ddi: path}} or {@code {csv: path}}: the file is read, and its variables merged, by
         * {@code codebook.Codebooks.resolve}, which knows the config file's folder.
         */
        CodebookSource codebook(ObjectNode node, String path) {
            if (node == null) {
                return null;
            }
            known(node, path, "ddi", "csv");
            if (node.size() != 1) {
                throw new ConfigException(path, "expected exactly one of ddi (a DDI-Codebook XML file) or csv (a CSV"
                        + " codebook, see docs/codebook-csv.md)");
            }
            String format = node.fieldNames().next();
            return new CodebookSource(format, text(node, format, path + "." + format, true), null);
        }

        /** Quartz accepts a cron whose every time is past (a year in the past); such a trigger never fires. */
        static boolean neverFires(String schedule) {
            try {
                return new CronExpression(schedule).getNextValidTimeAfter(new java.util.Date()) == null;
            } catch (java.text.ParseException e) {
                return false;
            }
        }

        List<RelationshipConfig> relationships(JsonNode node, String path) {
            if (node == null || node.isNull()) {
                return List.of();
            }
            if (!node.isArray()) {
                throw new ConfigException(path, "expected a list of {x, y, threshold}");
            }
            List<RelationshipConfig> out = new ArrayList<>();
            Set<Set<String>> seen = new HashSet<>();
            for (int i = 0; i < node.size(); i++) {
                String p = path + "[" + i + "]";
                ObjectNode o = asObject(node.get(i), p);
                known(o, p, "x", "y", "threshold");
                String x = Identifiers.require(p + ".x", text(o, "x", p + ".x", true));
                String y = Identifiers.require(p + ".y", text(o, "y", p + ".y", true));
                if (x.equals(y)) {
                    throw new ConfigException(p + ".y", "expected a column other than x, but both are '" + x + "'");
                }
                if (!seen.add(Set.of(x, y))) {
                    throw new ConfigException(p, "the pair " + x + " and " + y + " is listed twice");
                }
                Double threshold = null;
                if (o.has("threshold")) {
                    double t = number(o, "threshold", p + ".threshold", Double.NaN);
                    if (!(t > 0 && t < 2)) {
                        throw new ConfigException(p + ".threshold", "expected a difference of correlations above 0"
                                + " and below 2 (such as 0.1) but got " + o.get("threshold").asText());
                    }
                    threshold = t;
                }
                out.add(new RelationshipConfig(x, y, threshold));
            }
            return out;
        }

        DesignColumns design(ObjectNode node, String datasetPath, String waveColumn, String key, String weight) {
            if (node == null) {
                return null;
            }
            String p = datasetPath + ".design";
            known(node, p, "strata", "clusters");
            String strata = text(node, "strata", p + ".strata", false);
            String clusters = text(node, "clusters", p + ".clusters", false);
            if (clusters == null) {
                throw new ConfigException(p + ".clusters", "missing: the column naming each respondent's primary"
                        + " sampling unit (with strata optional); without clusters, weightColumn alone gives the"
                        + " weights-only design");
            }
            if (weight == null) {
                throw new ConfigException(datasetPath + ".weightColumn", "missing: a design needs the survey weights"
                        + " it was drawn with");
            }
            for (String[] c : new String[][] {{"strata", strata}, {"clusters", clusters}}) {
                if (c[1] == null) {
                    continue;
                }
                Identifiers.require(p + "." + c[0], c[1]);
                if (c[1].equals(waveColumn) || c[1].equals(key) || c[1].equals(weight)) {
                    throw new ConfigException(p + "." + c[0], "expected a column of its own, but '" + c[1]
                            + "' is the " + (c[1].equals(waveColumn) ? "wave column" : c[1].equals(key)
                            ? "respondent key" : "weight column"));
                }
            }
            if (strata != null && strata.equals(clusters)) {
                throw new ConfigException(p + ".clusters", "expected a column other than the strata column");
            }
            return new DesignColumns(strata, clusters);
        }

        String respondentKey(ObjectNode node, String path, String waveColumn) {
            String k = text(node, "respondentKey", path + ".respondentKey", false);
            if (k == null) {
                return null;
            }
            Identifiers.require(path + ".respondentKey", k);
            if (k.equals(waveColumn)) {
                throw new ConfigException(path + ".respondentKey", "expected the column identifying a respondent,"
                        + " not the wave column '" + k + "'");
            }
            return k;
        }

        /**
         * The earlier publications of a wave: a release column in the same table, or a previous table of the same
         * layout. Either way respondents are matched across the two by the respondent key, so it is required.
         */
        ReleasesConfig releases(ObjectNode node, String path, String key, String table, String pattern,
                                String waveColumn) {
            if (node == null) {
                return null;
            }
            String p = path + ".releases";
            known(node, p, "column", "previousTable");
            if (node.size() != 1) {
                throw new ConfigException(p, "expected exactly one of column (a release column in the same table)"
                        + " or previousTable (a table holding the earlier publication)");
            }
            if (key == null) {
                throw new ConfigException(path + ".respondentKey", "missing: releases are compared respondent by"
                        + " respondent, so name the column identifying a respondent");
            }
            if (node.has("column")) {
                String c = Identifiers.require(p + ".column", text(node, "column", p + ".column", true));
                if (c.equals(waveColumn) || c.equals(key)) {
                    throw new ConfigException(p + ".column", "expected a column of its own telling the releases"
                            + " apart, but '" + c + "' is the " + (c.equals(key) ? "respondent key" : "wave column"));
                }
                return new ReleasesConfig(c, null);
            }
            String prev = text(node, "previousTable", p + ".previousTable", true);
            if (table != null) {
                if (prev.contains("{wave}")) {
                    throw new ConfigException(p + ".previousTable", "expected one table (the dataset has one table"
                            + " with a wave column) but got the pattern " + Identifiers.Text.show(prev));
                }
                Identifiers.TableName before = Identifiers.TableName.parse(p + ".previousTable", prev);
                if (before.equals(Identifiers.TableName.parse(path + ".table", table))) {
                    throw new ConfigException(p + ".previousTable", "expected another table than the dataset's own "
                            + before);
                }
            } else {
                if (!prev.contains("{wave}")) {
                    throw new ConfigException(p + ".previousTable", "expected a pattern containing {wave} like the"
                            + " dataset's tablePattern, such as survey_v1.wave_{wave}");
                }
                Identifiers.TableName.parse(p + ".previousTable", prev.replace("{wave}", "w"));
                if (prev.equals(pattern)) {
                    throw new ConfigException(p + ".previousTable", "expected another pattern than the dataset's own "
                            + pattern);
                }
            }
            return new ReleasesConfig(null, prev);
        }

        String weightColumn(ObjectNode node, String path) {
            String w = text(node, "weightColumn", path + ".weightColumn", false);
            return w == null ? null : Identifiers.require(path + ".weightColumn", w);
        }

        String readyTable(ObjectNode node, String path) {
            String t = text(node, "readyTable", path + ".readyTable", false);
            if (t != null) {
                Identifiers.TableName.parse(path + ".readyTable", t);
            }
            return t;
        }

        String readyColumn(ObjectNode node, String path) {
            String c = text(node, "readyColumn", path + ".readyColumn", false);
            if ((c == null) != (node.get("readyTable") == null)) {
                throw new ConfigException(path + (c == null ? ".readyColumn" : ".readyTable"), "readyTable and"
                        + " readyColumn go together: the table lists released waves in that column");
            }
            return c == null ? null : Identifiers.require(path + ".readyColumn", c);
        }

        WaveOrder waveOrder(ObjectNode node, String path) {
            JsonNode w = node.get("waveOrder");
            if (w == null || w.isNull() || (w.isTextual() && w.asText().equals("natural"))) {
                return WaveOrder.NATURAL;
            }
            if (w.isArray()) {
                List<String> waves = texts(node, "waveOrder", path + ".waveOrder");
                if (waves.isEmpty() || new HashSet<>(waves).size() != waves.size()) {
                    throw new ConfigException(path + ".waveOrder", "expected a non-empty list of distinct wave labels");
                }
                return new WaveOrder(waves);
            }
            throw new ConfigException(path + ".waveOrder", "expected 'natural' or a list of wave labels");
        }

        /**
         * {@code compareWith}: one rule ({@code previous}, {@code {baseline: WAVE}}, {@code {pooledLast: K}},
         * {@code {sameWaveBack: K}}) or a list of rules judged alongside each other, the first being the run's main
         * baseline. A list holds no list, no rule twice, and at most one {@code baseline} and one {@code pooledLast}:
         * each further rule adds a comparison of every variable to the run's one false-discovery-rate family, so a
         * rule that can only repeat another's waves ({@code sameWaveBack: 1} or {@code pooledLast: 1} beside
         * {@code previous}) is refused rather than spending the family's power twice on the same comparison.
         */
        CompareWith compareWith(JsonNode node, String path) {
            if (node == null || node.isNull()) {
                return CompareWith.PREVIOUS;
            }
            if (!node.isArray()) {
                return compareRule(node, path);
            }
            if (node.isEmpty()) {
                throw new ConfigException(path, "expected at least one rule, e.g. [previous, {sameWaveBack: 4}];"
                        + " leave compareWith out for the previous wave");
            }
            List<CompareWith> rules = new ArrayList<>();
            for (int i = 0; i < node.size(); i++) {
                String p = path + "[" + i + "]";
                if (node.get(i).isArray()) {
                    throw new ConfigException(p, "expected one rule (previous, {baseline: WAVE}, {pooledLast: K} or"
                            + " {sameWaveBack: K}) but got a list; the rules of compareWith are one flat list");
                }
                CompareWith rule = compareRule(node.get(i), p);
                int twin = rules.indexOf(rule);
                if (twin >= 0) {
                    throw new ConfigException(p, "the same rule as " + path + "[" + twin + "]; list each rule once");
                }
                for (int j = 0; j < rules.size(); j++) {
                    CompareWith other = rules.get(j);
                    if (other.getClass() == rule.getClass() && (rule instanceof CompareWith.Baseline
                            || rule instanceof CompareWith.PooledLast)) {
                        throw new ConfigException(p, "a second " + ruleName(rule) + " rule beside " + path + "["
                                + j + "]; at most one fixed baseline and one pooled baseline are judged alongside");
                    }
                    if (sameAsPrevious(rule) && other instanceof CompareWith.Previous
                            || sameAsPrevious(other) && rule instanceof CompareWith.Previous) {
                        throw new ConfigException(p, "compares with the same wave as " + path + "[" + j + "]"
                                + " (the previous wave), so every comparison would be made twice; drop one of them");
                    }
                }
                rules.add(rule);
            }
            return rules.size() == 1 ? rules.get(0) : new CompareWith.Alongside(rules);
        }

        private static boolean sameAsPrevious(CompareWith rule) {
            return rule instanceof CompareWith.SameWaveBack s && s.waves() == 1
                    || rule instanceof CompareWith.PooledLast p && p.waves() == 1;
        }

        private static String ruleName(CompareWith rule) {
            return rule instanceof CompareWith.Baseline ? "baseline" : rule instanceof CompareWith.PooledLast
                    ? "pooledLast" : rule instanceof CompareWith.SameWaveBack ? "sameWaveBack" : "previous";
        }

        /** One rule of {@code compareWith}. */
        CompareWith compareRule(JsonNode node, String path) {
            if (node.isTextual() && node.asText().equals("previous")) {
                return CompareWith.PREVIOUS;
            }
            if (node.isObject()) {
                ObjectNode o = (ObjectNode) node;
                known(o, path, "baseline", "pooledLast", "sameWaveBack");
                if (o.size() != 1) {
                    throw new ConfigException(path, "expected exactly one of baseline, pooledLast or sameWaveBack");
                }
                if (o.has("baseline")) {
                    return new CompareWith.Baseline(text(o, "baseline", path + ".baseline", true));
                }
                String key = o.has("pooledLast") ? "pooledLast" : "sameWaveBack";
                int k = wholeNumber(o, key, path + "." + key, 1, 1000, "waves");
                return key.equals("pooledLast") ? new CompareWith.PooledLast(k) : new CompareWith.SameWaveBack(k);
            }
            throw new ConfigException(path, "expected previous, {baseline: WAVE}, {pooledLast: K} or"
                    + " {sameWaveBack: K} but got " + (node.isContainerNode() ? describe(node)
                    : Identifiers.Text.show(node.asText())) + (node.isTextual() ? Suggest.nearest(node.asText(),
                    List.of("previous")).map(x -> " (did you mean '" + x + "'?)").orElse("") : ""));
        }

        /** A required whole number from {@code min} to {@code max} of {@code unit}. */
        int wholeNumber(ObjectNode o, String key, String path, int min, int max, String unit) {
            double k = number(o, key, path, Double.NaN);
            if (k != Math.rint(k) || k < min || k > max) {
                throw new ConfigException(path, "expected a whole number of " + unit + " from " + min + " to " + max
                        + " but got " + o.get(key).asText());
            }
            return (int) k;
        }

        VariableConfig variable(ObjectNode node, String path) {
            known(node, path, "name", "kind", "unit", "range", "missingCodes", "threshold", "successValue", "levels",
                    "reference", "locationTest", "label", "valueLabels", "missingRanges");
            String name = Identifiers.require(path + ".name", text(node, "name", path + ".name", true));
            String kindText = text(node, "kind", path + ".kind", true);
            VariableKind kind = kind(kindText, path + ".kind");
            String unit = text(node, "unit", path + ".unit", false);
            RangeSpec range = range(object(node, "range", path + ".range", false), path + ".range", kind);
            List<MissingCodeSpec> codes = missingCodes(node.get("missingCodes"), path + ".missingCodes");
            Threshold threshold = threshold(object(node, "threshold", path + ".threshold", false),
                    path + ".threshold", kind);
            String success = text(node, "successValue", path + ".successValue", false);
            if (success != null && kind != VariableKind.BINARY) {
                throw new ConfigException(path + ".successValue", "only binary variables have a successValue; this"
                        + " one is " + kind.configName());
            }
            List<String> levels = texts(node, "levels", path + ".levels");
            if (!levels.isEmpty() && kind != VariableKind.ORDINAL) {
                throw new ConfigException(path + ".levels", "only ordinal variables have levels; this one is "
                        + kind.configName());
            }
            Reference reference = reference(object(node, "reference", path + ".reference", false),
                    path + ".reference", kind);
            LocationTestPin locationTest = locationTest(text(node, "locationTest", path + ".locationTest", false),
                    path + ".locationTest", kind);
            String label = text(node, "label", path + ".label", false);
            java.util.Map<String, String> valueLabels = valueLabels(node.get("valueLabels"), path + ".valueLabels");
            List<MissingRangeSpec> missingRanges = missingRanges(node.get("missingRanges"), path + ".missingRanges",
                    kind);
            return new VariableConfig(name, kind, unit, range, codes, threshold, success, levels, reference,
                    locationTest, label, valueLabels, missingRanges);
        }

        /**
         * Code -> label in the order written. A code is text as YAML gives it (1 and "1" are the same key); two keys
         * naming the same number (1 and 1.0) would give one answer two labels, so they are refused.
         */
        Map<String, String> valueLabels(JsonNode node, String path) {
            if (node == null || node.isNull()) {
                return Map.of();
            }
            if (!node.isObject()) {
                throw new ConfigException(path, "expected a map of code to label, such as {\"1\": \"Yes\"}, but got "
                        + describe(node));
            }
            Map<String, String> out = new LinkedHashMap<>();
            Map<String, String> numeric = new HashMap<>();
            var fields = node.fields();
            while (fields.hasNext()) {
                var e = fields.next();
                String code = e.getKey();
                String p = path + "." + code;
                if (code.isEmpty()) {
                    throw new ConfigException(path, "a code must not be empty");
                }
                if (!e.getValue().isTextual() && !e.getValue().isNumber()) {
                    throw new ConfigException(p, "expected the label as text but got " + describe(e.getValue()));
                }
                String number = org.wavewarden.codebook.CodeLabels.numericKey(code);
                String same = number == null ? null : numeric.put(number, code);
                if (same != null) {
                    throw new ConfigException(p, "the code " + Identifiers.Text.show(same) + " names the same number"
                            + " and already has a label");
                }
                out.put(code, e.getValue().asText());
            }
            return out;
        }

        /**
         * A variable's ranges of "no answer" values: {@code [{min: -99, max: -90, reason: "not asked"}, {max: -1}]},
         * either end open. Numbers only: a text or date variable has no numeric ranges.
         */
        List<MissingRangeSpec> missingRanges(JsonNode node, String path, VariableKind kind) {
            if (node == null || node.isNull()) {
                return List.of();
            }
            if (!node.isArray()) {
                throw new ConfigException(path, "expected a list of {min, max, reason} but got " + describe(node));
            }
            if (node.size() > 0 && (kind == VariableKind.TEXT || kind == VariableKind.DATE)) {
                throw new ConfigException(path, "missing ranges are ranges of numbers; a " + kind.configName()
                        + " variable has none (list its codes under missingCodes)");
            }
            List<MissingRangeSpec> out = new ArrayList<>();
            for (int i = 0; i < node.size(); i++) {
                String p = path + "[" + i + "]";
                ObjectNode o = asObject(node.get(i), p);
                known(o, p, "min", "max", "reason");
                Double min = o.hasNonNull("min") ? number(o, "min", p + ".min", Double.NaN) : null;
                Double max = o.hasNonNull("max") ? number(o, "max", p + ".max", Double.NaN) : null;
                if (min == null && max == null) {
                    throw new ConfigException(p, "expected min, max or both (leave one out for an open end)");
                }
                if ((min != null && !Double.isFinite(min)) || (max != null && !Double.isFinite(max))) {
                    throw new ConfigException(p, "expected finite numbers as min and max");
                }
                if (min != null && max != null && min > max) {
                    throw new ConfigException(p, "min " + min + " is above max " + max);
                }
                String reason = text(o, "reason", p + ".reason", false);
                out.add(new MissingRangeSpec(min, max, reason == null ? "missing range" : reason));
            }
            return out;
        }

        LocationTestPin locationTest(String text, String path, VariableKind kind) {
            if (text == null) {
                return null;
            }
            if (kind != VariableKind.CONTINUOUS) {
                throw new ConfigException(path, "only continuous variables choose between means and ranks; a "
                        + kind.configName() + " variable has one test");
            }
            List<String> names = java.util.Arrays.stream(LocationTestPin.values()).map(LocationTestPin::configName)
                    .toList();
            for (LocationTestPin p : LocationTestPin.values()) {
                if (p.configName().equals(text)) {
                    return p;
                }
            }
            throw new ConfigException(path, "expected means or ranks but got " + Identifiers.Text.show(text)
                    + Suggest.nearest(text, names).map(s -> " (did you mean '" + s + "'?)").orElse(""));
        }

        Reference reference(ObjectNode node, String path, VariableKind kind) {
            if (node == null) {
                return null;
            }
            known(node, path, "mean", "shares");
            if (node.size() != 1) {
                throw new ConfigException(path, "expected exactly one of mean or shares");
            }
            if (node.has("mean")) {
                if (!kind.isNumericScale()) {
                    throw new ConfigException(path + ".mean", "a reference mean applies to continuous and ordinal"
                            + " variables; for a " + kind.configName() + " variable give shares");
                }
                double m = number(node, "mean", path + ".mean", Double.NaN);
                if (!Double.isFinite(m)) {
                    throw new ConfigException(path + ".mean", "expected a finite number");
                }
                return new Reference(m, null);
            }
            if (kind != VariableKind.CATEGORICAL && kind != VariableKind.BINARY) {
                throw new ConfigException(path + ".shares", "reference shares apply to categorical and binary"
                        + " variables; for a " + kind.configName() + " variable give a mean");
            }
            ObjectNode shares = asObject(node.get("shares"), path + ".shares");
            java.util.Map<String, Double> out = new java.util.LinkedHashMap<>();
            double sum = 0;
            var it = shares.fieldNames();
            while (it.hasNext()) {
                String category = it.next();
                double share = number(shares, category, path + ".shares." + category, Double.NaN);
                if (!(share > 0 && share < 1)) {
                    throw new ConfigException(path + ".shares." + category, "expected a share strictly between 0"
                            + " and 1 but got " + share);
                }
                out.put(category, share);
                sum += share;
            }
            if (out.isEmpty() || sum > 1 + 1e-9) {
                throw new ConfigException(path + ".shares", "expected at least one share, summing to at most 1"
                        + " (the rest belongs to the answers not listed); they sum to " + sum);
            }
            return new Reference(null, out);
        }

        VariableKind kind(String text, String path) {
            for (VariableKind k : VariableKind.values()) {
                if (k.configName().equals(text)) {
                    return k;
                }
            }
            List<String> names = java.util.Arrays.stream(VariableKind.values()).map(VariableKind::configName).toList();
            throw new ConfigException(path, "expected one of " + String.join(", ", names) + " but got '" + text + "'"
                    + Suggest.nearest(text, names).map(s -> " (did you mean '" + s + "'?)").orElse(""));
        }

        RangeSpec range(ObjectNode node, String path, VariableKind kind) {
            if (node == null) {
                return null;
            }
            known(node, path, "min", "max");
            if (!kind.isNumericScale()) {
                throw new ConfigException(path, "a range applies to continuous and ordinal variables; this one is "
                        + kind.configName());
            }
            Double min = node.has("min") ? number(node, "min", path + ".min", Double.NaN) : null;
            Double max = node.has("max") ? number(node, "max", path + ".max", Double.NaN) : null;
            if (min == null && max == null) {
                throw new ConfigException(path, "expected min, max or both");
            }
            if (min != null && max != null && min > max) {
                throw new ConfigException(path, "min " + min + " is above max " + max);
            }
            return new RangeSpec(min, max);
        }

        List<MissingCodeSpec> missingCodes(JsonNode node, String path) {
            if (node == null || node.isNull()) {
                return List.of();
            }
            if (!node.isArray()) {
                throw new ConfigException(path, "expected a list of {value, reason}");
            }
            List<MissingCodeSpec> out = new ArrayList<>();
            for (int i = 0; i < node.size(); i++) {
                String p = path + "[" + i + "]";
                ObjectNode o = asObject(node.get(i), p);
                known(o, p, "value", "reason");
                JsonNode v = o.get("value");
                if (v == null || !(v.isTextual() || v.isNumber())) {
                    throw new ConfigException(p + ".value", "expected the coded value as a number or text");
                }
                String reason = text(o, "reason", p + ".reason", false);
                out.add(new MissingCodeSpec(v.asText(), reason == null ? "missing code" : reason));
            }
            return out;
        }

        Threshold threshold(ObjectNode node, String path, VariableKind kind) {
            if (node == null) {
                return null;
            }
            known(node, path, "raw", "points", "effect");
            if (node.size() != 1) {
                throw new ConfigException(path, "expected exactly one of raw, points or effect");
            }
            String scale = node.fieldNames().next();
            double value = number(node, scale, path + "." + scale, Double.NaN);
            if (!(value > 0) || Double.isInfinite(value)) {
                throw new ConfigException(path + "." + scale, "expected a positive number but got " + value);
            }
            switch (scale) {
                case "raw" -> {
                    if (!kind.isNumericScale()) {
                        throw new ConfigException(path + ".raw", "raw units apply to continuous and ordinal variables;"
                                + " for a " + kind.configName() + " variable use points (percentage points) or effect");
                    }
                    return new Threshold(value, null, null);
                }
                case "points" -> {
                    if (kind != VariableKind.BINARY && kind != VariableKind.CATEGORICAL) {
                        throw new ConfigException(path + ".points", "percentage points apply to binary and categorical"
                                + " shares; for a " + kind.configName() + " variable use raw or effect");
                    }
                    if (value > 100) {
                        throw new ConfigException(path + ".points", "expected at most 100 percentage points");
                    }
                    return new Threshold(null, value, null);
                }
                default -> {
                    EffectScale tightest = EffectScale.tightest(kind);
                    if (tightest == null) {
                        throw new ConfigException(path + ".effect", "effect-scale thresholds apply to compared"
                                + " variables; a " + kind.configName() + (kind == VariableKind.DATE
                                ? " variable is judged on the KS distance against its fixed 0.1"
                                : " variable is screened, not compared"));
                    }
                    if (value > tightest.max()) {
                        throw new ConfigException(path + ".effect", "effect-scale thresholds of " + kind.configName()
                                + " variables are judged on " + orList(EffectScale.of(kind).stream()
                                .map(EffectScale::label).toList()) + ", so at most "
                                + (tightest.max() == Math.PI ? "pi" : String.valueOf((long) tightest.max())) + " ("
                                + tightest.label() + " cannot exceed it); got " + value
                                + (kind.isNumericScale() ? ": was a raw-unit threshold meant?" : ""));
                    }
                    return new Threshold(null, null, value);
                }
            }
        }

        static String orList(List<String> items) {
            return items.size() < 2 ? String.join("", items) : String.join(", ", items.subList(0, items.size() - 1))
                    + " or " + items.get(items.size() - 1);
        }

        // --- small typed accessors that name the key on failure ---

        void known(ObjectNode node, String path, String... keys) {
            Set<String> allowed = Set.of(keys);
            Iterator<String> it = node.fieldNames();
            while (it.hasNext()) {
                String k = it.next();
                if (!allowed.contains(k)) {
                    String where = path.isEmpty() ? k : path + "." + k;
                    throw new ConfigException(where, "unknown key" + Suggest.nearest(k, List.of(keys))
                            .map(s -> "; did you mean '" + s + "'?").orElse("; expected one of "
                                    + String.join(", ", keys)));
                }
            }
        }

        ObjectNode object(ObjectNode parent, String key, String path, boolean required) {
            JsonNode n = parent.get(key);
            if (n == null || n.isNull()) {
                if (required) {
                    throw new ConfigException(path, "missing");
                }
                return null;
            }
            return asObject(n, path);
        }

        ObjectNode asObject(JsonNode n, String path) {
            if (!n.isObject()) {
                throw new ConfigException(path, "expected a mapping but got " + describe(n));
            }
            return (ObjectNode) n;
        }

        String text(ObjectNode parent, String key, String path, boolean required) {
            JsonNode n = parent.get(key);
            if (n == null || n.isNull()) {
                if (required) {
                    throw new ConfigException(path, "missing");
                }
                return null;
            }
            if (!(n.isTextual() || n.isNumber())) {
                throw new ConfigException(path, "expected text but got " + describe(n));
            }
            String s = n.asText();
            if (required && s.isBlank()) {
                throw new ConfigException(path, "expected a value but it is empty");
            }
            return s;
        }

        double number(ObjectNode parent, String key, String path, double dflt) {
            JsonNode n = parent.get(key);
            if (n == null || n.isNull()) {
                if (Double.isNaN(dflt)) {
                    throw new ConfigException(path, "missing");
                }
                return dflt;
            }
            if (!n.isNumber()) {
                throw new ConfigException(path, "expected a number but got " + describe(n));
            }
            return n.asDouble();
        }

        List<String> texts(ObjectNode parent, String key, String path) {
            JsonNode n = parent.get(key);
            if (n == null || n.isNull()) {
                return List.of();
            }
            if (!n.isArray()) {
                throw new ConfigException(path, "expected a list but got " + describe(n));
            }
            List<String> out = new ArrayList<>();
            for (int i = 0; i < n.size(); i++) {
                JsonNode e = n.get(i);
                if (!(e.isTextual() || e.isNumber())) {
                    throw new ConfigException(path + "[" + i + "]", "expected text but got " + describe(e));
                }
                out.add(e.asText());
            }
            return out;
        }

        static String describe(JsonNode n) {
            String type = n.isObject() ? "a mapping" : n.isArray() ? "a list" : n.isBoolean() ? "a boolean"
                    : n.isNumber() ? "a number" : "text";
            return n.isValueNode() ? type + " (" + n.asText().toLowerCase(Locale.ROOT) + ")" : type;
        }
    }
}
