package org.wavewarden.cli;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.wavewarden.console.auth.PasswordHashes;
import picocli.CommandLine;

import java.io.ByteArrayInputStream;
import java.io.OutputStream;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayDeque;
import java.util.Deque;
import java.util.List;
import java.util.concurrent.TimeUnit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * {@code console-password}: a password in, its Argon2id hash out, and a password never taken from the command line
 * (where the shell's history and the list of processes would keep it).
 */
class ConsolePasswordCommandTest {

    @Test
    void aPasswordPipedIntoTheProgramComesOutAsAHashThatVerifies() throws Exception {
        List<String> cmd = List.of(Path.of(System.getProperty("java.home"), "bin", "java").toString(), "-Xmx256m",
                "-cp", System.getProperty("java.class.path"), Main.class.getName(), "console-password", "--stdin");
        Process p = new ProcessBuilder(cmd).start();
        try (OutputStream in = p.getOutputStream()) {
            in.write("tide-gauge-42\n".getBytes(StandardCharsets.UTF_8));
        }
        String out = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
        String err = new String(p.getErrorStream().readAllBytes(), StandardCharsets.UTF_8);
        assertTrue(p.waitFor(120, TimeUnit.SECONDS));
        assertEquals(Main.OK, p.exitValue(), err);
        List<String> lines = out.lines().toList();
        assertEquals(1, lines.size(), "one line, the hash, so that a script can take it: " + out);
        assertTrue(lines.get(0).startsWith("$argon2id$v=19$"), out);
        assertTrue(PasswordHashes.matches("tide-gauge-42".toCharArray(), lines.get(0)));
        assertFalse(PasswordHashes.matches("tide-gauge-42\n".toCharArray(), lines.get(0)), "the line end is no part");
        assertFalse((out + err).contains("tide-gauge-42"));
    }

    @ParameterizedTest(name = "{0}")
    @ValueSource(strings = {"tide-gauge-42", "--password=tide-gauge-42", "--stdin tide-gauge-42", "-p tide-gauge-42"})
    void aPasswordOnTheCommandLineIsRefusedAndNotRepeated(String arguments) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        String[] args = ("console-password " + arguments).split(" ");
        assertEquals(Main.USAGE, Main.run(args, new PrintWriter(out, true), new PrintWriter(err, true)));
        assertEquals("", out.toString());
        assertTrue(err.toString().contains("never read from the command line"), err.toString());
        assertFalse(err.toString().contains("tide-gauge-42"), err.toString());
    }

    record Run(int exit, String out, String err) {
    }

    static Run run(ConsolePasswordCommand.Terminal terminal, String stdin, String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        CommandLine cl = new CommandLine(new ConsolePasswordCommand(terminal,
                new ByteArrayInputStream(stdin.getBytes(StandardCharsets.UTF_8))));
        cl.setOut(new PrintWriter(out, true));
        cl.setErr(new PrintWriter(err, true));
        return new Run(cl.execute(args), out.toString(), err.toString());
    }

    /** Answers each prompt with the next line, as a person at the terminal would. */
    static ConsolePasswordCommand.Terminal typing(String... lines) {
        Deque<String> typed = new ArrayDeque<>(List.of(lines));
        return prompt -> typed.isEmpty() ? null : typed.removeFirst().toCharArray();
    }

    @Test
    void atTheTerminalThePasswordIsTypedTwice() {
        Run same = run(typing("lantern-ferry-7", "lantern-ferry-7"), "");
        assertEquals(Main.OK, same.exit(), same.err());
        assertTrue(PasswordHashes.matches("lantern-ferry-7".toCharArray(), same.out().strip()));

        Run differ = run(typing("lantern-ferry-7", "lantern-ferry-8"), "");
        assertEquals(Main.USAGE, differ.exit());
        assertEquals("", differ.out(), "nothing printed when the two differ");
        assertTrue(differ.err().contains("the two passwords differ"), differ.err());
    }

    @Test
    void withoutATerminalItAsksForStdin() {
        Run r = run(null, "tide-gauge-42\n");
        assertEquals(Main.USAGE, r.exit());
        assertTrue(r.err().contains("--stdin"), r.err());
    }

    @ParameterizedTest(name = "input {index}")
    @ValueSource(strings = {"", "\n", "\r\n", "tide\tgauge\n"})
    void anEmptyOrGarbledPasswordIsRefused(String stdin) {
        Run r = run(null, stdin, "--stdin");
        assertEquals(Main.USAGE, r.exit(), r.err());
        assertEquals("", r.out());
    }

    @Test
    void aWindowsLineEndIsNoPartOfThePassword() {
        Run r = run(null, "moor-lark-19\r\nsecond line ignored\n", "--stdin");
        assertEquals(Main.OK, r.exit(), r.err());
        assertTrue(PasswordHashes.matches("moor-lark-19".toCharArray(), r.out().strip()));
    }

    @Test
    void anOverlongLineIsRefused() {
        Run r = run(null, "x".repeat(ConsolePasswordCommand.MAX_CHARS + 1) + "\n", "--stdin");
        assertEquals(Main.USAGE, r.exit());
        assertTrue(r.err().contains("longer than 1024"), r.err());
    }
}
