package org.wavewarden.config;

import java.util.List;
import java.util.Set;

/**
 * Where a dataset's alerts go besides the alerts table (which always gets them).
 *
 * @param jsonLines     a JSON Lines file; null for none
 * @param webhook       an HTTP endpoint; null for none
 * @param email         an SMTP relay and its recipients; null for none
 * @param digestBaseUrl where the daemon's output folder is published (no trailing slash), so a roll-up can link
 *                      each firing's digest; null for no links
 */
public record SinkSettings(JsonLines jsonLines, Webhook webhook, Email email, String digestBaseUrl) {

    public static final SinkSettings NONE = new SinkSettings(null, null, null, null);

    public SinkSettings(JsonLines jsonLines, Webhook webhook) {
        this(jsonLines, webhook, null, null);
    }

    /** Which alerts a sink takes: shifts at least as urgent as a verdict, and data-quality findings of some kinds. */
    public record Filter(String minimumVerdict, Set<String> kinds) {
        public Filter {
            kinds = kinds == null ? Set.of() : Set.copyOf(kinds);
        }
    }

    /**
     * What a sink is sent for a firing: one message per alert, one roll-up listing the firing's new alerts, or both.
     * The configuration spells them {@code perAlert}, {@code perFiring} and {@code both}.
     */
    public enum Messages {
        PER_ALERT("perAlert"), PER_FIRING("perFiring"), BOTH("both");

        private final String key;

        Messages(String key) {
            this.key = key;
        }

        public String key() {
            return key;
        }

        public boolean perAlert() {
            return this != PER_FIRING;
        }

        public boolean perFiring() {
            return this != PER_ALERT;
        }

        /** The value for a configuration spelling, or null when there is none. */
        public static Messages of(String key) {
            for (Messages m : values()) {
                if (m.key.equals(key)) {
                    return m;
                }
            }
            return null;
        }
    }

    public record JsonLines(String path, Filter filter) {
    }

    /**
     * @param url       the endpoint (http or https)
     * @param secretEnv environment variable holding the shared HMAC secret; never the secret itself
     * @param messages  per alert (the default, as before roll-ups existed), per firing, or both
     * @param textField null to post the full JSON message; otherwise the one field of a JSON object that carries
     *                  the message as plain text, for chat tools that take a simple text field
     */
    public record Webhook(String url, String secretEnv, Filter filter, Messages messages, String textField) {
        public Webhook(String url, String secretEnv, Filter filter) {
            this(url, secretEnv, filter, Messages.PER_ALERT, null);
        }

        public Webhook {
            messages = messages == null ? Messages.PER_ALERT : messages;
        }
    }

    /** How the connection to the SMTP relay is protected. */
    public enum Tls {
        /** STARTTLS is required and the server's certificate and host name are checked. */
        STARTTLS,
        /** No TLS at all: only for a relay on the loopback interface of the same machine. */
        NONE
    }

    /**
     * @param host        the SMTP relay
     * @param port        its submission port
     * @param tls         STARTTLS (required, the default) or none (loopback relay only)
     * @param caFile      a PEM file of the certificate authorities trusted for the relay; null for the Java
     *                    runtime's own trust store
     * @param userEnv     environment variable holding the SMTP user name; null to send without authentication
     * @param passwordEnv environment variable holding the SMTP password; never the password itself
     * @param from        the sender address
     * @param to          the recipients, at least one
     * @param messages    per firing (the default), per alert, or both
     */
    public record Email(String host, int port, Tls tls, String caFile, String userEnv, String passwordEnv,
                        String from, List<String> to, Filter filter, Messages messages) {
        public Email {
            to = List.copyOf(to);
            tls = tls == null ? Tls.STARTTLS : tls;
            messages = messages == null ? Messages.PER_FIRING : messages;
        }
    }
}
