package org.wavewarden.cli;

import java.io.PrintWriter;
import java.util.Locale;
import java.util.function.LongConsumer;

/** Row counts on an interactive terminal while long work runs; silent in pipes, files and logs. */
final class Progress {

    private Progress() {
    }

    static LongConsumer rows(String what, PrintWriter err) {
        if (System.console() == null) {
            return n -> { };
        }
        return n -> {
            err.print(String.format(Locale.ROOT, "\r%s: %,d rows", what, n));
            err.flush();
        };
    }

    static void done(PrintWriter err) {
        if (System.console() != null) {
            err.print("\r\033[K");
            err.flush();
        }
    }
}
