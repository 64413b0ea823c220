package org.wavewarden.config;

import java.util.Set;

/**
 * Where a dataset's alerts go besides the alerts table (which always gets them).
 *
 * @param jsonLines a JSON Lines file; null for none
 * @param webhook   an HTTP endpoint; null for none
 */
public record SinkSettings(JsonLines jsonLines, Webhook webhook) {

    public static final SinkSettings NONE = new SinkSettings(null, null);

    /** Which alerts a sink takes: shifts at least as urgent as a verdict, and data-quality findings of some kinds. */
    public record Filter(String minimumVerdict, Set<String> kinds) {
        public Filter {
            kinds = kinds == null ? Set.of() : Set.copyOf(kinds);
        }
    }

    public record JsonLines(String path, Filter filter) {
    }

    /**
     * @param url       the endpoint (http or https)
     * @param secretEnv environment variable holding the shared HMAC secret; never the secret itself
     */
    public record Webhook(String url, String secretEnv, Filter filter) {
    }
}
