package org.wavewarden.cli;

import picocli.CommandLine.Option;

import java.util.Map;

/**
 * {@code --as NAME}: the person an action on an alert or a wave is recorded under. Without it, the environment
 * variable {@value #ENV} names them (set once per login or per service account), else the operating-system user.
 */
final class ActorOption {

    static final String ENV = "WAVEWARDEN_ACTOR";

    @Option(names = "--as", paramLabel = "NAME", description = "the person acting (default: $" + ENV
            + ", else the login name)")
    String name;

    /** The acting person; refused (a usage error) when every source is blank. */
    String resolve() {
        return resolve(name, System.getenv(), System.getProperty("user.name"));
    }

    /**
     * The option when given, else the environment variable when set, else the user name. A source that is given is
     * used or refused, never skipped: a blank {@code --as} is a mistake to report, not a reason to record the
     * action under the login name instead.
     */
    static String resolve(String option, Map<String, String> env, String userName) {
        String[][] sources = {{"--as", option}, {ENV, env.get(ENV)}, {"the user name", userName}};
        for (String[] s : sources) {
            if (s[1] == null) {
                continue;
            }
            if (s[1].isBlank() || s[1].chars().anyMatch(Character::isISOControl)) {
                throw new Refused("the acting person from " + s[0] + " is " + (s[1].isBlank() ? "blank"
                        : "not a plain name") + "; give a name with --as NAME");
            }
            return s[1].strip();
        }
        throw new Refused("no acting person: give --as NAME or set " + ENV);
    }

    /** An action that is not taken, for a reason the person can act on: exit 2 with the message. */
    static final class Refused extends RuntimeException {
        Refused(String message) {
            super(message);
        }
    }
}
