package org.wavewarden.cli;

import org.wavewarden.console.auth.PasswordHashes;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Unmatched;

import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.List;
import java.util.concurrent.Callable;

@Command(name = "console-password", mixinStandardHelpOptions = true,
        description = "Print the Argon2id hash of a console password, for console.users[].passwordHash (or the"
                + " variable named by passwordHashEnv). The password is typed twice at the terminal without echo, or"
                + " read as one line from standard input with --stdin; it is never taken as an argument, where it"
                + " would stay in the shell's history and the list of processes.")
final class ConsolePasswordCommand implements Callable<Integer> {

    /** A line longer than this is refused rather than hashed: no one types it, and it would only cost time. */
    static final int MAX_CHARS = 1024;

    @Option(names = "--stdin", description = "read the password as one line from standard input (for scripts)")
    boolean stdin;

    // Anything else on the command line lands here, so that it is refused without picocli repeating it in an error
    // message (it may be the password).
    @Unmatched
    List<String> unmatched;

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    /** Reads a password without echo; the process's terminal in production. */
    interface Terminal {
        /** The line typed after {@code prompt}, or null when there is no more input. */
        char[] readPassword(String prompt);
    }

    private final Terminal terminal;
    private final InputStream in;

    ConsolePasswordCommand() {
        this(System.console() == null ? null : prompt -> System.console().readPassword("%s", prompt), System.in);
    }

    ConsolePasswordCommand(Terminal terminal, InputStream in) {
        this.terminal = terminal;
        this.in = in;
    }

    @Override
    public Integer call() throws IOException {
        var err = spec.commandLine().getErr();
        if (unmatched != null && !unmatched.isEmpty()) {
            err.println("console-password takes no arguments (" + unmatched.size() + " given, not shown): a password"
                    + " is never read from the command line; type it when asked, or pipe it in with --stdin");
            return Main.USAGE;
        }
        char[] password = stdin ? line(in) : typedTwice(err);
        if (password == null) {
            return Main.USAGE;
        }
        try {
            String problem = problem(password);
            if (problem != null) {
                err.println(problem);
                return Main.USAGE;
            }
            spec.commandLine().getOut().println(PasswordHashes.encode(password));
            spec.commandLine().getOut().flush();
            return Main.OK;
        } finally {
            Arrays.fill(password, '\0');
        }
    }

    private char[] typedTwice(java.io.PrintWriter err) {
        if (terminal == null) {
            err.println("no terminal to read the password from; pipe it in with --stdin");
            return null;
        }
        char[] first = terminal.readPassword("Password: ");
        if (first == null) {
            err.println("no password read");
            return null;
        }
        char[] second = terminal.readPassword("The same again: ");
        try {
            if (second == null || !Arrays.equals(first, second)) {
                Arrays.fill(first, '\0');
                err.println("the two passwords differ; nothing printed");
                return null;
            }
            return first;
        } finally {
            if (second != null) {
                Arrays.fill(second, '\0');
            }
        }
    }

    /** The first line of {@code in} without its line end; the rest is ignored. */
    static char[] line(InputStream in) throws IOException {
        Reader r = new InputStreamReader(in, StandardCharsets.UTF_8);
        char[] buf = new char[MAX_CHARS + 2];
        int n = 0;
        int c;
        while ((c = r.read()) != -1 && c != '\n' && n < buf.length) {
            buf[n++] = (char) c;
        }
        if (n > 0 && buf[n - 1] == '\r') {
            n--;
        }
        char[] out = Arrays.copyOf(buf, n);
        Arrays.fill(buf, '\0');
        return out;
    }

    private static String problem(char[] password) {
        if (password.length == 0) {
            return "the password is empty; nothing printed";
        }
        if (password.length > MAX_CHARS) {
            return "the password is longer than " + MAX_CHARS + " characters; nothing printed";
        }
        for (char ch : password) {
            if (Character.isISOControl(ch)) {
                // A control character is more likely a paste gone wrong than part of a password anyone can type.
                return "the password holds a control character; nothing printed";
            }
        }
        return null;
    }
}
