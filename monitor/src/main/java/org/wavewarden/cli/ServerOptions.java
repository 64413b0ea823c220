package org.wavewarden.cli;

import picocli.CommandLine.Option;

/**
 * Where a command that builds its own tables runs ({@code bench}, {@code soak}): an embedded server unless a
 * PostgreSQL server is named. The password comes from an environment variable, never from the command line.
 */
final class ServerOptions {

    @Option(names = "--jdbc-url", paramLabel = "URL", description = "PostgreSQL server (default: an embedded one)")
    String jdbcUrl;
    @Option(names = "--user", paramLabel = "U", description = "login role for --jdbc-url")
    String user;
    @Option(names = "--password-env", paramLabel = "VAR", description = "environment variable holding the password")
    String passwordEnv;
}
