package org.wavewarden.testing;

import org.wavewarden.cli.Main;

import java.io.PrintWriter;
import java.io.StringWriter;

/** Runs the real command line in-process and captures what it printed. */
public record CliRun(int exitCode, String out, String err) {

    public static CliRun of(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = Main.run(args, new PrintWriter(out, true), new PrintWriter(err, true));
        return new CliRun(code, out.toString(), err.toString());
    }
}
