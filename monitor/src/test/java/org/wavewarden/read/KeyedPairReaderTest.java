package org.wavewarden.read;

import org.jdbi.v3.core.Jdbi;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.wavewarden.config.Identifiers.TableName;
import org.wavewarden.testing.TestDatabase;

import java.sql.Connection;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Two selections of one table matched by respondent key on a real server: each row of each side arrives exactly
 * once, respondents pair up, and NULL or duplicated keys are counted, not fatal.
 */
class KeyedPairReaderTest {

    static Jdbi jdbi;
    static final WaveSource SOURCE = new WaveSource(new TableName("src", "pairs"), "wave", null, "rel");

    @BeforeAll
    static void setUp() throws Exception {
        String url = TestDatabase.freshDatabase("pairs");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            // Column names k, r, n and c0 are the reader's own aliases: they must not collide. A tab, a line break
            // and a backslash must survive the COPY text format.
            st.execute("""
                    CREATE SCHEMA src;
                    CREATE TABLE src.pairs (wave text, rel int, id int, k text, r int, n text, c0 text);
                    INSERT INTO src.pairs VALUES
                      ('it''s', 1, 1, 'a', 1, 'tab\there', NULL),
                      ('it''s', 2, 1, 'a', 2, 'tab\there', 'x'),
                      ('it''s', 1, 2, 'b', 1, E'line\\nbreak', 'y'),
                      ('it''s', 2, 3, 'c', 1, E'back\\\\slash', 'z'),
                      ('it''s', 1, 4, 'd', 1, 'dup', 'p'),
                      ('it''s', 1, 4, 'd', 2, 'dup', 'q'),
                      ('it''s', 2, 4, 'd', 3, 'dup', 'p'),
                      ('it''s', 2, 5, 'e', 1, 'only twice after', 'p'),
                      ('it''s', 2, 5, 'e', 1, 'only twice after', 'p'),
                      ('it''s', 1, NULL, 'f', 1, 'no key', 'p'),
                      ('it''s', 2, NULL, 'f', 1, 'no key', 'p'),
                      ('other', 2, 1, 'a', 9, 'another wave', 'x');
                    """);
        }
        jdbi = Jdbi.create(url, "postgres", "");
    }

    record Call(String kind, String key, List<String> before, List<String> after) {
        @Override
        public String toString() {
            return kind + " " + key + " " + before + " " + after;
        }
    }

    static List<Call> read(List<String> columns, List<KeyedPairReader.PairScan> scan) {
        List<Call> calls = new ArrayList<>();
        KeyedPairReader.Visitor v = new KeyedPairReader.Visitor() {
            @Override
            public void row(String key, String[] before, String[] after) {
                calls.add(new Call("row", key, copy(before), copy(after)));
            }

            @Override
            public void unmatched(String key, String[] before, String[] after) {
                calls.add(new Call("unmatched", key, copy(before), copy(after)));
            }
        };
        scan.add(jdbi.withHandle(h -> KeyedPairReader.read(h, "id", columns,
                new KeyedPairReader.Selection("release 1", SOURCE.fromClause("it's", "1")),
                new KeyedPairReader.Selection("release 2", SOURCE.fromClause("it's", "2")), v, null)));
        return calls;
    }

    static List<String> copy(String[] a) {
        return a == null ? null : Arrays.asList(a.clone());
    }

    static List<String> sorted(List<Call> calls, String kind) {
        return calls.stream().filter(c -> c.kind().equals(kind)).map(Call::toString).sorted().toList();
    }

    @Test
    void everyRowOfEachSideArrivesOnceAndRespondentsPairUp() {
        List<KeyedPairReader.PairScan> scan = new ArrayList<>();
        List<Call> calls = read(List.of("k", "r", "n", "c0"), scan);
        assertEquals(List.of(
                "row 1 [a, 1, tab\there, null] [a, 2, tab\there, x]",
                "row 2 [b, 1, line\nbreak, y] null",
                "row 3 null [c, 1, back\\slash, z]"), sorted(calls, "row"));
        // Respondent 4 is twice in release 1, 5 twice in release 2, and a key is NULL on each side. How rows of a
        // duplicated key pair up is not defined; what is, is that each row of each side comes once, matched to no one.
        List<String> unmatchedRows = new ArrayList<>();
        calls.stream().filter(c -> c.kind().equals("unmatched")).forEach(c -> {
            if (c.before() != null) {
                unmatchedRows.add(c.key() + " before " + c.before());
            }
            if (c.after() != null) {
                unmatchedRows.add(c.key() + " after " + c.after());
            }
        });
        assertEquals(List.of(
                "4 after [d, 3, dup, p]",
                "4 before [d, 1, dup, p]",
                "4 before [d, 2, dup, q]",
                "5 after [e, 1, only twice after, p]",
                "5 after [e, 1, only twice after, p]",
                "null after [f, 1, no key, p]",
                "null before [f, 1, no key, p]"), unmatchedRows.stream().sorted().toList());
        assertEquals(6, sorted(calls, "unmatched").size());
        KeyedPairReader.PairScan s = scan.get(0);
        assertEquals(new KeyedPairReader.SideKeys(5, 1, 1, 2, List.of("4")), s.before());
        assertEquals(new KeyedPairReader.SideKeys(6, 1, 1, 2, List.of("5")), s.after());
        assertEquals(2, s.before().keyedRows()); // respondents 1 and 2
        assertEquals(9, s.joinedRows());
    }

    @Test
    void noColumnsStillMatchesTheKeys() {
        List<KeyedPairReader.PairScan> scan = new ArrayList<>();
        assertEquals(List.of("row 1 [] []", "row 2 [] null", "row 3 null []"), sorted(read(List.of(), scan), "row"));
        assertEquals(9, scan.get(0).joinedRows());
    }

    @Test
    void aMissingKeyColumnIsASourceReadErrorNotAHang() {
        var e = assertThrows(WaveScanner.SourceReadException.class, () -> jdbi.withHandle(h -> KeyedPairReader.read(h,
                "person_id", List.of(), new KeyedPairReader.Selection("release 1", SOURCE.fromClause("it's", "1")),
                new KeyedPairReader.Selection("release 2", SOURCE.fromClause("it's", "2")),
                new KeyedPairReader.Visitor() {
                    @Override
                    public void row(String key, String[] before, String[] after) {
                    }

                    @Override
                    public void unmatched(String key, String[] before, String[] after) {
                    }
                }, null)));
        assertTrue(e.getMessage().contains("reading release 1 beside release 2 failed")
                && e.getMessage().contains("person_id"), e.getMessage());
    }
}
