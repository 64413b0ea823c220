package org.wavewarden.config;

/**
 * How to reach a PostgreSQL server. The password is never written in the config: it is read from the named
 * environment variable or file when the connection is opened.
 *
 * @param jdbcUrl      {@code jdbc:postgresql://...}, or {@code embedded} for a server started in-process
 * @param user         login role
 * @param passwordEnv  environment variable holding the password; optional
 * @param passwordFile file holding the password (first line); optional
 */
public record ConnectionConfig(String jdbcUrl, String user, String passwordEnv, String passwordFile) {

    public static final String EMBEDDED = "embedded";

    public boolean isEmbedded() {
        return EMBEDDED.equals(jdbcUrl);
    }

    @Override
    public String toString() {
        // Deliberately omits nothing secret: the record holds only where the password lives, never the password.
        return "ConnectionConfig[jdbcUrl=" + jdbcUrl + ", user=" + user + "]";
    }
}
