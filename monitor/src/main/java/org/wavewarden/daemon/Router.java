package org.wavewarden.daemon;

import org.eclipse.jetty.http.HttpHeader;
import org.eclipse.jetty.http.HttpMethod;
import org.eclipse.jetty.server.Handler;
import org.eclipse.jetty.server.Request;
import org.eclipse.jetty.server.Response;
import org.eclipse.jetty.util.Callback;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.Objects;

/**
 * Routes requests by exact path and method: an unknown path is 404, a known path with another method is 405 with an
 * {@code Allow} header. Exact matching keeps the surface small and predictable (no prefix or trailing-slash
 * variants answer by accident); the web console will add its routes here. Routes are added before the server
 * starts and not changed afterwards.
 */
public final class Router extends Handler.Abstract {

    private static final Logger LOG = LoggerFactory.getLogger(Router.class);

    /** What an endpoint answers: a status, a media type and a body (which HEAD leaves out). */
    public record Reply(int status, String contentType, byte[] body, Map<String, String> headers) {
        public Reply {
            Objects.requireNonNull(contentType, "contentType");
            body = body == null ? new byte[0] : body;
            headers = headers == null ? Map.of() : Map.copyOf(headers);
        }

        public Reply(int status, String contentType, byte[] body) {
            this(status, contentType, body, Map.of());
        }

        /** The same reply with one more header (e.g. {@code Set-Cookie}, {@code Location}); replaces a same-named one. */
        public Reply with(String name, String value) {
            Map<String, String> all = new LinkedHashMap<>(headers);
            all.put(name, value);
            return new Reply(status, contentType, body, all);
        }

        public static Reply text(int status, String text) {
            return new Reply(status, "text/plain; charset=utf-8", text.getBytes(StandardCharsets.UTF_8));
        }

        public static Reply of(int status, String contentType, String body) {
            return new Reply(status, contentType, body.getBytes(StandardCharsets.UTF_8));
        }
    }

    /** One route's work; it runs on the server's bounded pool and may block (a file read, a database query). */
    @FunctionalInterface
    public interface Endpoint {
        Reply answer(Request request) throws Exception;
    }

    private final Map<String, Map<String, Endpoint>> routes = new LinkedHashMap<>();

    /** Answers GET and HEAD on {@code path}. */
    public Router get(String path, Endpoint endpoint) {
        return route(HttpMethod.GET.asString(), path, endpoint).route(HttpMethod.HEAD.asString(), path, endpoint);
    }

    /** Answers {@code method} on exactly {@code path}. */
    public Router route(String method, String path, Endpoint endpoint) {
        if (isStarted()) {
            throw new IllegalStateException("routes are fixed once the server runs");
        }
        if (!path.startsWith("/")) {
            throw new IllegalArgumentException("path: expected one starting with '/' but got " + path);
        }
        Endpoint previous = routes.computeIfAbsent(path, p -> new LinkedHashMap<>()).putIfAbsent(method,
                Objects.requireNonNull(endpoint, "endpoint"));
        if (previous != null) {
            throw new IllegalArgumentException(method + " " + path + " is routed twice");
        }
        return this;
    }

    @Override
    public boolean handle(Request request, Response response, Callback callback) {
        Map<String, Endpoint> byMethod = routes.get(Request.getPathInContext(request));
        Reply reply;
        if (byMethod == null) {
            reply = Reply.text(404, "not found\n");
        } else {
            Endpoint endpoint = byMethod.get(request.getMethod());
            if (endpoint == null) {
                response.getHeaders().put(HttpHeader.ALLOW, String.join(", ", byMethod.keySet()));
                reply = Reply.text(405, "method not allowed\n");
            } else {
                reply = answer(endpoint, request);
            }
        }
        response.setStatus(reply.status());
        response.getHeaders().put(HttpHeader.CONTENT_TYPE, reply.contentType());
        response.getHeaders().put(HttpHeader.CACHE_CONTROL, "no-store");
        response.getHeaders().put("X-Content-Type-Options", "nosniff");
        reply.headers().forEach((name, value) -> response.getHeaders().put(name, value));
        response.getHeaders().put(HttpHeader.CONTENT_LENGTH, reply.body().length);
        response.write(true, ByteBuffer.wrap(reply.body()), callback);
        return true;
    }

    private static Reply answer(Endpoint endpoint, Request request) {
        try {
            return endpoint.answer(request);
        } catch (Exception e) {
            // The message may carry database or file details: the client gets none of it, the log names the class.
            LOG.warn("{} {} failed: {}", request.getMethod(), Request.getPathInContext(request),
                    e.getClass().getName(), e);
            return Reply.text(500, "internal error\n");
        }
    }
}
