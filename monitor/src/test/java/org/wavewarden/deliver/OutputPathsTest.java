package org.wavewarden.deliver;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.nio.file.Path;
import java.util.HashSet;
import java.util.List;
import java.util.Set;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** A name made from data stays inside its folder, is told apart from every other label's, and never changes. */
class OutputPathsTest {

    static final List<String> HOSTILE = List.of("../../x", "/abs/dir", "", " ", "   ", "\n", "\t", "line\nbreak",
            "..", ".", "a/b", "a_b", "a\\b", "C:\\temp", ".hidden", "w1", "2025-Q1", "\u00e9t\u00e9", "x".repeat(300));

    @TempDir
    Path dir;

    @Test
    void everyLabelGetsAFolderDirectlyUnderItsParent() {
        Path parent = dir.resolve("out");
        for (String label : HOSTILE) {
            Path p = OutputPaths.under(parent, label).toAbsolutePath().normalize();
            assertEquals(parent.toAbsolutePath().normalize(), p.getParent(), "label " + escaped(label));
        }
    }

    @Test
    void differentLabelsGetDifferentNamesAndTheSameLabelTheSameName() {
        Set<String> names = new HashSet<>();
        for (String label : HOSTILE) {
            String name = OutputPaths.name(label);
            assertTrue(names.add(name), "two labels share " + name);
            assertEquals(name, OutputPaths.name(new String(label.toCharArray())));
        }
    }

    @Test
    void theNameIsTheReadablePartOfTheLabelAndAShortHash() {
        assertTrue(OutputPaths.name("2025-Q1").matches("2025-Q1-[0-9a-f]{8}"), OutputPaths.name("2025-Q1"));
        assertTrue(OutputPaths.name("../../x").matches("___\\.\\._x-[0-9a-f]{8}"), OutputPaths.name("../../x"));
        assertTrue(OutputPaths.name("").matches("_-[0-9a-f]{8}"));
        assertTrue(OutputPaths.name("x".repeat(300)).length() <= OutputPaths.READABLE + 9);
        for (String label : HOSTILE) {
            String name = OutputPaths.name(label);
            assertTrue(name.matches("[A-Za-z0-9_-][A-Za-z0-9._-]*"), "name of " + escaped(label) + ": " + name);
        }
    }

    @Test
    void aWaveFolderLiesUnderItsDatasetFolder() {
        Path wave = OutputPaths.wave(dir, "../up", "/abs/dir");
        assertEquals(dir.toAbsolutePath().normalize(), wave.toAbsolutePath().normalize().getParent().getParent());
    }

    static String escaped(String label) {
        return label.replace("\n", "\\n").replace("\t", "\\t");
    }
}
