package org.wavewarden.cli;

import org.wavewarden.config.ConfigException;
import org.wavewarden.pipeline.Session;
import picocli.CommandLine;
import picocli.CommandLine.Command;

import java.io.PrintWriter;

/**
 * The one executable. Its exit codes are the constants below; the README's table of exit codes lists the same, and
 * {@code ExitCodeTableTest} holds the two together.
 */
@Command(name = "wavewarden", mixinStandardHelpOptions = true, versionProvider = Main.Version.class,
        description = "Judges each new survey wave against earlier waves and flags disguised missing values.",
        subcommands = {DemoCommand.class, InitDbCommand.class, ImportCommand.class, WavesCommand.class,
                CheckCommand.class, ReleasesCommand.class, RunCommand.class, OutboxCommand.class, AlertsCommand.class,
                SignOffCommand.class, BenchCommand.class, ConsoleBenchCommand.class,
                SoakCommand.class, ScaffoldCommand.class, ServerCommand.class,
                ConsolePasswordCommand.class,
                ConsoleCommand.class,
                CommandLine.HelpCommand.class})
public final class Main implements Runnable {

    /** Done: judged, imported, listed or migrated as asked. */
    public static final int OK = 0;
    /** {@code check --fail-on}: a finding at or above the given verdict. */
    public static final int FINDINGS = 1;
    /** A bad command line or config, refused with the key before anything is written. */
    public static final int USAGE = 2;
    /** A database cannot be reached or refuses the login. */
    public static final int UNREACHABLE = 3;
    /**
     * Anything else failed: an unexpected error, or a firing of {@code run --once} that still failed after its
     * retries while both databases answer. The message or the log says why.
     */
    public static final int FAILED = 4;
    /** Something a committed run owes (a file, an alert) is still pending or dead-lettered. */
    public static final int DELIVERY_FAILING = 5;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    public static void main(String[] args) {
        System.exit(run(args, new PrintWriter(System.out, true), new PrintWriter(System.err, true)));
    }

    /** Runs a command line and returns its exit code; the tests call this directly. */
    public static int run(String[] args, PrintWriter out, PrintWriter err) {
        CommandLine cl = new CommandLine(new Main());
        cl.setOut(out);
        cl.setErr(err);
        cl.setExecutionExceptionHandler((ex, line, parsed) -> {
            Throwable e = ex;
            while (e instanceof RuntimeException && e.getCause() != null && !(e instanceof ConfigException)
                    && !(e instanceof Session.DatabaseUnavailableException) && e.getCause() instanceof RuntimeException) {
                e = e.getCause();
            }
            if (e instanceof ConfigException ce) {
                line.getErr().println("config error at " + ce.key() + ": " + ce.problem());
                return USAGE;
            }
            if (e instanceof org.wavewarden.load.CsvWaveImporter.ImportRefusedException ir) {
                line.getErr().println("import refused: " + ir.getMessage());
                return USAGE;
            }
            if (e instanceof org.wavewarden.db.Databases.LoginFailedException lf) {
                line.getErr().println("database login refused: " + lf.getMessage());
                return UNREACHABLE;
            }
            if (e instanceof Session.DatabaseUnavailableException du) {
                line.getErr().println("database unreachable: " + du.getMessage());
                return UNREACHABLE;
            }
            if (e instanceof org.jdbi.v3.core.ConnectionException || isConnectionFailure(e)) {
                line.getErr().println("database unreachable: " + e.getMessage());
                return UNREACHABLE;
            }
            line.getErr().println("error: " + e);
            return FAILED;
        });
        cl.setParameterExceptionHandler((ex, a) -> {
            ex.getCommandLine().getErr().println(ex.getMessage());
            ex.getCommandLine().usage(ex.getCommandLine().getErr());
            return USAGE;
        });
        return cl.execute(args);
    }

    /**
     * The exit code of a {@code run --once} whose firing failed after its retries: 3 when a database does not
     * answer now (the likeliest cause), else 4.
     */
    static int firingFailed(Session s) {
        try {
            s.source().useHandle(h -> h.execute("SELECT 1"));
            s.store().jdbi().useHandle(h -> h.execute("SELECT 1"));
            return FAILED;
        } catch (RuntimeException e) {
            return UNREACHABLE;
        }
    }

    static boolean isConnectionFailure(Throwable e) {
        for (Throwable t = e; t != null; t = t.getCause()) {
            if (t instanceof java.sql.SQLException s && s.getSQLState() != null && s.getSQLState().startsWith("08")) {
                return true;
            }
            if (t instanceof java.sql.SQLTransientConnectionException) {
                return true;
            }
        }
        return false;
    }

    @Override
    public void run() {
        spec.commandLine().usage(spec.commandLine().getOut());
    }

    static final class Version implements CommandLine.IVersionProvider {
        @Override
        public String[] getVersion() {
            String v = Main.class.getPackage().getImplementationVersion();
            return new String[] {"wavewarden " + (v == null ? "development build" : v)};
        }
    }
}
