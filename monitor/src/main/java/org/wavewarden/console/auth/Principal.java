package org.wavewarden.console.auth;

import org.wavewarden.review.Role;

import java.util.Objects;

/**
 * A person the console has recognised.
 *
 * @param via how: {@code password} (a login form) or {@code proxy} (a trusted reverse proxy's header)
 */
public record Principal(String name, Role role, String via) {
    public Principal {
        Objects.requireNonNull(name, "name");
        Objects.requireNonNull(role, "role");
        Objects.requireNonNull(via, "via");
    }
}
