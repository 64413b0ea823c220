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

    /** The first of the option, the environment variable and the user name that is not blank, stripped. */
    static String resolve(String option, Map<String, String> env, String userName) {
        for (String candidate : new String[] {option, env.get(ENV), userName}) {
            if (candidate != null && !candidate.isBlank()) {
                if (candidate.chars().anyMatch(Character::isISOControl)) {
                    throw new Refused("the acting person's name holds a control character; give a plain name with"
                            + " --as");
                }
                return candidate.strip();
            }
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
