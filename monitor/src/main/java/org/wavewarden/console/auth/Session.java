package org.wavewarden.console.auth;

import java.time.Instant;
import java.util.Objects;

/**
 * A logged-in person's session. The id is the cookie's secret and the CSRF token the forms' secret: neither is
 * ever written to a log, so {@link #toString()} leaves both out.
 */
public record Session(String id, Principal principal, String csrfToken, Instant createdAt, Instant lastSeenAt) {
    public Session {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(principal, "principal");
        Objects.requireNonNull(csrfToken, "csrfToken");
    }

    @Override
    public String toString() {
        return "Session[" + principal.name() + ", " + principal.role().key() + ", since " + createdAt + "]";
    }
}
