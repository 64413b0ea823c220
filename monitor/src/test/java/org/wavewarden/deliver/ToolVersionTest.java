package org.wavewarden.deliver;

import org.junit.jupiter.api.Test;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** findings.json names the version that wrote it: the Maven project version, as the build filtered it in. */
class ToolVersionTest {

    @Test
    void theToolVersionIsTheProjectVersionOfTheBuild() throws Exception {
        String pom = Files.readString(Path.of("..", "pom.xml"));
        Matcher m = Pattern.compile("<artifactId>wavewarden-parent</artifactId>\\s*<version>([^<]+)</version>")
                .matcher(pom);
        assertTrue(m.find(), "the parent pom names its version");
        assertEquals(m.group(1), ToolVersion.current());
    }
}
