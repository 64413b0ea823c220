package org.wavewarden.deliver.sink;

import java.net.URI;
import java.net.http.HttpClient;
import java.nio.file.Path;
import java.time.Duration;
import java.util.Collection;
import java.util.Objects;
import java.util.function.Function;

/**
 * Builds sinks from plain configuration values, so that the configuration reader needs to know nothing about
 * sinks beyond names and strings. Webhook secrets are named by an environment variable, never written in the
 * configuration, in line with the database passwords.
 */
public final class SinkFactory {

    private SinkFactory() {
    }

    /**
     * @param minimumVerdict a {@link org.wavewarden.judge.Verdict} name or null for all verdicts
     * @param kinds          {@link org.wavewarden.judge.FindingKind} names; null or empty for every data-quality kind
     */
    public static JsonLinesSink jsonLines(Path path, String minimumVerdict, Collection<String> kinds) {
        return new JsonLinesSink(Objects.requireNonNull(path, "path"), SinkFilter.of(minimumVerdict, kinds));
    }

    /**
     * @param secretEnv   the environment variable holding the shared secret
     * @param environment looks a variable up ({@code System::getenv} in production)
     */
    public static WebhookSink webhook(URI url, String secretEnv, Function<String, String> environment,
                                      String minimumVerdict, Collection<String> kinds, RetryPolicy retry,
                                      DeadLetters deadLetters, HttpClient client) {
        return webhook(url, secretEnv, environment, minimumVerdict, kinds, retry, deadLetters, client,
                WebhookSink.REQUEST_TIMEOUT);
    }

    /** @param requestTimeout how long one attempt may take, connection included */
    public static WebhookSink webhook(URI url, String secretEnv, Function<String, String> environment,
                                      String minimumVerdict, Collection<String> kinds, RetryPolicy retry,
                                      DeadLetters deadLetters, HttpClient client, Duration requestTimeout) {
        return new WebhookSink(url, secret(secretEnv, environment), SinkFilter.of(minimumVerdict, kinds), retry,
                deadLetters, client, requestTimeout);
    }

    /** The secret from the environment, or an error naming the variable (never its value). */
    public static String secret(String secretEnv, Function<String, String> environment) {
        if (secretEnv == null || !secretEnv.matches("[A-Za-z_][A-Za-z0-9_]*")) {
            throw new IllegalArgumentException("secretEnv: expected an environment variable name but got "
                    + secretEnv);
        }
        String value = Objects.requireNonNull(environment, "environment").apply(secretEnv);
        if (value == null || value.isEmpty()) {
            throw new IllegalArgumentException("secretEnv: environment variable " + secretEnv
                    + " is not set or empty; it must hold the webhook's shared secret");
        }
        return value;
    }

    /**
     * An HTTP client for webhooks: HTTP/1.1 (one small POST gains nothing from HTTP/2, and the cleartext upgrade
     * to it confuses some receivers), a short connect timeout, redirects not followed (a redirect is an error).
     */
    public static HttpClient httpClient() {
        return HttpClient.newBuilder()
                .version(HttpClient.Version.HTTP_1_1)
                .connectTimeout(Duration.ofSeconds(5))
                .followRedirects(HttpClient.Redirect.NEVER)
                .build();
    }
}
