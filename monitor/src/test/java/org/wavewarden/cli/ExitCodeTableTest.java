package org.wavewarden.cli;

import org.junit.jupiter.api.Test;

import java.lang.reflect.Field;
import java.lang.reflect.Modifier;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;
import java.util.TreeSet;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertTrue;

/** The README's table of exit codes and the codes the command line returns are the same list. */
class ExitCodeTableTest {

    @Test
    void everyExitCodeOfTheCommandLineIsInTheReadmeTableAndEveryRowIsOneItReturns() throws Exception {
        String readme = Files.readString(Path.of("..", "README.md"));
        int start = readme.indexOf("| code | meaning |", readme.indexOf("Exit codes ("));
        assertTrue(start >= 0, "the README has the exit-code table");
        String table = readme.substring(start, readme.indexOf("\n\n", start));
        Map<Integer, String> rows = new TreeMap<>();
        Matcher m = Pattern.compile("(?m)^\\| (\\d+) \\| (.+) \\|$").matcher(table);
        while (m.find()) {
            rows.put(Integer.parseInt(m.group(1)), m.group(2));
        }
        Set<Integer> returned = new TreeSet<>();
        for (Field f : Main.class.getFields()) {
            if (f.getType() == int.class && Modifier.isStatic(f.getModifiers()) && Modifier.isFinal(f.getModifiers())) {
                returned.add(f.getInt(null));
            }
        }
        assertTrue(returned.containsAll(Set.of(0, 1, 2, 3, 4)), "the codes of the command line: " + returned);
        for (int code : returned) {
            assertTrue(rows.containsKey(code), "exit code " + code + " is in the README table: " + rows.keySet());
        }
        for (Map.Entry<Integer, String> row : rows.entrySet()) {
            boolean explained = returned.contains(row.getKey()) || row.getKey() == 143
                    || row.getValue().startsWith("reserved");
            assertTrue(explained, "README row " + row.getKey() + " is a code the command line returns, the JVM's"
                    + " SIGTERM code, or marked reserved");
        }
    }
}
