package org.wavewarden.cli;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.testing.CliRun;

import java.util.ArrayList;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Options of {@code signoff} that contradict each other are refused before the configuration is read (the file
 * named does not exist, so getting further would be a config error instead), with exit 2 and what to do.
 */
class SignOffCommandUsageTest {

    /** Each row: the arguments after {@code signoff --config FILE}, separated by commas, and the first line printed. */
    @ParameterizedTest(name = "signoff {0}")
    @CsvSource(delimiter = '|', textBlock = """
            --show,w3,--force,--reason,late | --show reads a sign-off; --force, --reason, --release and --as belong to signing
            --show,w3,--as,R. Ashdown       | --show reads a sign-off; --force, --reason, --release and --as belong to signing
            --show,--release,2              | --show reads a sign-off; --force, --reason, --release and --as belong to signing
            --as,R. Ashdown                 | name the WAVE to sign off
            w3,--force                      | --force needs --reason TEXT: a forced sign-off records why it went ahead
            w3,--force,--reason,' '         | --force needs --reason TEXT: a forced sign-off records why it went ahead
            w3,--reason,board meeting       | --reason goes with --force; to explain an alert use 'alerts explain ID --reason KEY'
            """)
    void contradictoryOptionsAreRefused(String options, String message) {
        List<String> args = new ArrayList<>(List.of("signoff", "--config", "no-such-config.yaml"));
        for (String a : options.split(",")) {
            args.add(a.equals("' '") ? " " : a);
        }
        CliRun r = CliRun.of(args.toArray(String[]::new));
        assertEquals(2, r.exitCode(), r.err());
        assertEquals(message, r.err().lines().findFirst().orElse(""), args + " printed: " + r.err());
        assertTrue(r.err().contains("Usage: wavewarden signoff"), r.err());
    }
}
