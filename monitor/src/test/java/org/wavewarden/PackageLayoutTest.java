package org.wavewarden;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import java.util.TreeSet;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The package tables of the README ("Code layout") and of DEVELOPERS.md ("Where things are") name exactly the
 * packages of the main code, so a package added, moved or removed shows up in both or fails here.
 */
class PackageLayoutTest {

    private static final Path MAIN = Path.of("src", "main", "java", "org", "wavewarden");
    private static final Pattern NAME = Pattern.compile("`([a-z]+(?:\\.[a-z]+)*)`");

    /** Every folder under org.wavewarden that holds a Java source, as a name relative to org.wavewarden. */
    static Set<String> mainPackages() throws IOException {
        Set<String> out = new TreeSet<>();
        try (Stream<Path> files = Files.walk(MAIN)) {
            files.filter(f -> f.toString().endsWith(".java")).map(Path::getParent).filter(p -> !p.equals(MAIN))
                    .forEach(p -> out.add(MAIN.relativize(p).toString().replace(p.getFileSystem().getSeparator(), ".")));
        }
        return out;
    }

    /**
     * The backquoted names in the {@code package} column of the first table after {@code heading}: the rows are the
     * lines starting with a bar, the first of them the header, the second its rule.
     */
    static Set<String> tablePackages(String document, String heading) {
        int at = document.indexOf("\n" + heading + "\n");
        assertTrue(at >= 0, "the document has the section " + heading);
        List<String> rows = new ArrayList<>();
        for (String line : document.substring(at + heading.length() + 2).split("\n")) {
            if (line.startsWith("|")) {
                rows.add(line);
            } else if (!rows.isEmpty() || line.startsWith("#")) {
                break;
            }
        }
        assertTrue(rows.size() > 2, "a table follows " + heading);
        List<String> header = cells(rows.get(0));
        int column = header.indexOf("package");
        assertTrue(column >= 0, "the table after " + heading + " has a package column: " + header);
        Set<String> out = new TreeSet<>();
        for (String row : rows.subList(2, rows.size())) {
            Matcher m = NAME.matcher(cells(row).get(column));
            while (m.find()) {
                out.add(m.group(1));
            }
        }
        return out;
    }

    private static List<String> cells(String row) {
        String inner = row.strip().substring(1, row.strip().length() - 1);
        return Stream.of(inner.split("\\|", -1)).map(String::strip).toList();
    }

    @ParameterizedTest(name = "{0} {1}")
    @CsvSource({"README.md, ## Code layout", "DEVELOPERS.md, ## Where things are"})
    void theDocumentsPackageTableNamesExactlyThePackagesOfTheMainCode(String file, String heading) throws IOException {
        Set<String> listed = tablePackages(Files.readString(Path.of("..", file)), heading);
        Set<String> actual = mainPackages();

        Set<String> missing = new TreeSet<>(actual);
        missing.removeAll(listed);
        Set<String> gone = new TreeSet<>(listed);
        gone.removeAll(actual);
        assertEquals(Set.of(), missing, file + " lacks these packages of the main code");
        assertEquals(Set.of(), gone, file + " lists packages the main code does not have");
    }

    @Test
    void onlyThePackageColumnOfTheSectionsOwnTableIsRead() {
        String doc = "intro\n## Code layout\n\n| stage | package | what |\n|---|---|---|\n"
                + "| read | `read`, `nowhere` | scans, with `profile` named in passing |\n\nmore text\n| x | `y` | z |\n";
        assertEquals(Set.of("read", "nowhere"), tablePackages(doc, "## Code layout"),
                "only the package column of the section's own table is read");
    }

    @Test
    void everyMainPackageSaysWhatItOwnsInAPackageInfo() throws IOException {
        Set<String> without = new TreeSet<>();
        for (String p : mainPackages()) {
            Path info = MAIN.resolve(p.replace('.', '/')).resolve("package-info.java");
            if (!Files.exists(info) || !Files.readString(info).contains("/**")) {
                without.add(p);
            }
        }
        assertEquals(Set.of(), without, "packages without a documented package-info.java");
        assertFalse(mainPackages().isEmpty(), "the main code is found from the module folder");
    }
}
