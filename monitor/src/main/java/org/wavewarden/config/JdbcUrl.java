package org.wavewarden.config;

import java.util.ArrayList;
import java.util.List;
import java.util.Set;

/**
 * The rules for a connection's {@code jdbcUrl}. The driver lets the URL's own parameters replace every property
 * the monitor sets, so a parameter such as {@code options} could switch the source session out of read-only mode
 * and {@code password} would put a secret in the config. The URL may therefore carry only parameters on an allow
 * list: where the server is, how to encrypt the link, and timeouts. Everything about the session and every
 * credential comes from the monitor and from the {@code user}, {@code passwordEnv} and {@code passwordFile} keys.
 */
public final class JdbcUrl {

    public static final String PREFIX = "jdbc:postgresql:";

    /** PostgreSQL JDBC driver parameters that cannot change what the session may do and carry no secret. */
    public static final List<String> ALLOWED = List.of("ssl", "sslmode", "sslrootcert", "sslcert", "sslkey",
            "sslNegotiation", "sslResponseTimeout", "channelBinding", "requireAuth", "gssEncMode", "connectTimeout",
            "socketTimeout", "loginTimeout", "cancelSignalTimeout", "tcpKeepAlive", "tcpNoDelay", "ApplicationName",
            "targetServerType", "loadBalanceHosts", "hostRecheckSeconds");

    private static final Set<String> SECRETS = Set.of("password", "sslpassword");

    private JdbcUrl() {
    }

    /**
     * Refuses a URL that is not a PostgreSQL JDBC URL, that carries user-info, or that has a parameter outside
     * {@link #ALLOWED}. The message shows the URL only as {@link #redacted(String)} gives it.
     *
     * @param key the full key path of the URL, e.g. {@code source.jdbcUrl}
     */
    public static void check(String key, String url) {
        if (!url.startsWith(PREFIX)) {
            throw new ConfigException(key, "expected 'embedded' or a URL starting with jdbc:postgresql:// but got '"
                    + cut(redacted(url)) + "'");
        }
        if (userInfo(url) >= 0) {
            throw new ConfigException(key, "a user name or password in the URL (" + cut(redacted(url)) + ") is not"
                    + " accepted: the role comes from the user key, the password only from passwordEnv or"
                    + " passwordFile");
        }
        for (String name : parameterNames(url)) {
            if (SECRETS.contains(name)) {
                throw new ConfigException(key, "the URL parameter '" + name + "' is not accepted: secrets come only"
                        + " from passwordEnv or passwordFile, never from the URL");
            }
            if (name.equals("user")) {
                throw new ConfigException(key, "the URL parameter 'user' is not accepted: the role comes from the"
                        + " user key");
            }
            if (!ALLOWED.contains(name)) {
                throw new ConfigException(key, "the URL parameter '" + cut(name) + "' is not accepted: it can change"
                        + " how the session behaves or what it may do; the URL may carry only "
                        + String.join(", ", ALLOWED));
            }
        }
    }

    /**
     * The URL with anything that might be a secret replaced by {@code ***}: the user-info before {@code @}, and
     * the value of every parameter that is not on the allow list.
     */
    public static String redacted(String url) {
        int at = userInfo(url);
        String shown = url;
        if (at >= 0) {
            int start = shown.indexOf("//") + 2;
            shown = shown.substring(0, start) + "***" + shown.substring(at);
        }
        int q = shown.indexOf('?');
        if (q < 0) {
            return shown;
        }
        List<String> parts = new ArrayList<>();
        for (String token : shown.substring(q + 1).split("&", -1)) {
            int eq = token.indexOf('=');
            String name = eq < 0 ? token : token.substring(0, eq);
            parts.add(eq < 0 || ALLOWED.contains(name) ? token : name + "=***");
        }
        return shown.substring(0, q + 1) + String.join("&", parts);
    }

    /** The index of the {@code @} that ends user-info in the URL's authority, or -1 when there is none. */
    private static int userInfo(String url) {
        int slashes = url.indexOf("//");
        int q = url.indexOf('?');
        if (slashes < 0 || (q >= 0 && q < slashes)) {
            return -1;
        }
        int end = url.length();
        for (char c : new char[] {'/', '?', '#'}) {
            int i = url.indexOf(c, slashes + 2);
            if (i >= 0 && i < end) {
                end = i;
            }
        }
        int at = url.lastIndexOf('@', end - 1);
        return at > slashes ? at : -1;
    }

    private static List<String> parameterNames(String url) {
        int q = url.indexOf('?');
        List<String> names = new ArrayList<>();
        if (q < 0) {
            return names;
        }
        for (String token : url.substring(q + 1).split("&")) {
            if (!token.isEmpty()) {
                int eq = token.indexOf('=');
                names.add(eq < 0 ? token : token.substring(0, eq));
            }
        }
        return names;
    }

    private static String cut(String s) {
        return s.length() > 120 ? s.substring(0, 120) + "..." : s;
    }
}
