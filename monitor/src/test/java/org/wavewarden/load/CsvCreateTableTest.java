package org.wavewarden.load;

import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.StorageType;
import org.wavewarden.codebook.VariableMeta;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.Identifiers.TableName;
import org.wavewarden.testing.TestDatabase;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.SQLException;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Importing a CSV file with {@code create}: a missing table is made from the file, each column's type decided over
 * every row with its evidence printed (a codebook's storage types first); an existing table is never widened or
 * retyped.
 */
class CsvCreateTableTest extends SmallSurveyImportTest {

    StringWriter notes;

    CsvCreateTableTest() {
        super("csvcreate");
    }

    @BeforeEach
    void notes() {
        notes = new StringWriter();
    }

    CsvWaveImporter.Imported load(String table, Path csv, DatasetCodebook codebook) throws Exception {
        try (Connection c = TestDatabase.connect(url)) {
            return CsvWaveImporter.load(c, TableName.parse("table", table), "wave", "w1", csv, false, null,
                    CsvWaveImporter.CsvFormat.detect(), true, codebook, new PrintWriter(notes, true));
        }
    }

    /** The table's columns and their types as the catalog gives them, in order. */
    Map<String, String> types(String table) throws SQLException {
        Map<String, String> out = new LinkedHashMap<>();
        try (Connection c = TestDatabase.connect(url); var ps = c.prepareStatement("SELECT a.attname,"
                + " format_type(a.atttypid, a.atttypmod) || CASE WHEN a.attnotnull THEN ' not null' ELSE '' END"
                + " FROM pg_catalog.pg_attribute a WHERE a.attrelid = ?::regclass AND a.attnum > 0"
                + " AND NOT a.attisdropped ORDER BY a.attnum")) {
            ps.setString(1, table);
            try (var rs = ps.executeQuery()) {
                while (rs.next()) {
                    out.put(rs.getString(1), rs.getString(2));
                }
            }
        }
        return out;
    }

    static VariableMeta declared(String name, StorageType storage) {
        return new VariableMeta(name, null, storage, null, null, null, null, null, null, null, null, null);
    }

    @Test
    void aMissingTableIsCreatedWithEachColumnsTypeDecidedOverEveryRowAndTheEvidencePrinted() throws Exception {
        Path csv = write("visits.csv", """
                id,income,code,visit,stamp,note,blank,Region,seen
                1,1200,1,2024-01-31,2024-01-31 10:00,a,,north,2024-01-01
                2,2.5,2,2024-02-29,2024-02-01T08:30:15,b,,south,2024-01-02
                3,1e3,3,2023-12-01,2024-03-01,"c, d",,east,2023-02-30
                4,-7,n/a,2024-03-15,2024-03-02 00:00:00.5,,,west,2024-01-04
                5,, 5 ,2024-04-30,2024-04-01,e,,,2024-01-05
                """);
        assertEquals(5, load("src.visits", csv, null).rows());
        Map<String, String> expected = new LinkedHashMap<>();
        expected.put("wave", "text not null");
        expected.put("id", "bigint");
        expected.put("income", "double precision");
        expected.put("code", "text");
        expected.put("visit", "date");
        expected.put("stamp", "timestamp without time zone");
        expected.put("note", "text");
        expected.put("blank", "text");
        expected.put("region", "text");
        expected.put("seen", "text");
        assertEquals(expected, types("src.visits"));
        assertEquals("1", text("SELECT count(*) FROM pg_catalog.pg_index i JOIN pg_catalog.pg_attribute a"
                + " ON a.attrelid = i.indrelid AND a.attnum = i.indkey[0] WHERE i.indrelid = 'src.visits'::regclass"
                + " AND a.attname = 'wave'"));
        String printed = notes.toString();
        for (String line : List.of(
                "created table src.visits with 10 columns and an index on wave:",
                "wave text (the wave column)",
                "id bigint (every one of 5 values is an integer)",
                "income double precision (every one of 4 values is a number; value '2.5' at line 3 is not an"
                        + " integer)",
                "code text (value 'n/a' at line 5 is not a number)",
                "visit date (every one of 5 values is an ISO date (YYYY-MM-DD))",
                "stamp timestamp (every one of 5 values is an ISO date or date-time)",
                "blank text (no values)",
                "seen text (value '2023-02-30' at line 4 is not a date)")) {
            assertTrue(printed.contains(line), line + " in\n" + printed);
        }
        assertEquals("1000", text("SELECT income FROM src.visits WHERE id = 3"));
        assertEquals(" 5 ", text("SELECT code FROM src.visits WHERE id = 5"));
        assertEquals("c, d", text("SELECT note FROM src.visits WHERE id = 3"));
        assertEquals("1", text("SELECT count(*) FROM src.visits WHERE income IS NULL AND note IS NOT NULL"
                + " AND region IS NULL"));
        assertEquals("2024-03-02 00:00:00.5", text("SELECT stamp FROM src.visits WHERE id = 4"));
        assertEquals("5", text("SELECT count(*) FROM src.visits WHERE wave = 'w1'"));
    }

    @Test
    void numbersWithADecimalCommaStayTextAndTheReasonSaysWhy() throws Exception {
        Path csv = write("shares.csv", "id;share\n1;0,5\n2;1,25\n");
        load("src.shares", csv, null);
        assertEquals("text", types("src.shares").get("share"));
        assertTrue(notes.toString().contains("share text (value '0,5' at line 2 is not a number (numbers are read"
                + " with a decimal point only))"), notes.toString());
        assertEquals("1,25", text("SELECT share FROM src.shares WHERE id = 2"));
    }

    @Test
    void aCodebooksStorageTypesWinOverTheValues() throws Exception {
        Path csv = write("coded.csv", "id,Code,income,visit\n1,1,100,2024-01-01\n2,2,200,2024-01-02\n");
        DatasetCodebook codebook = new DatasetCodebook("coded.xml", null, List.of(declared("code", StorageType.TEXT),
                declared("income", StorageType.NUMBER), declared("visit", StorageType.DATE)));
        load("src.coded", csv, codebook);
        assertEquals(Map.of("wave", "text not null", "id", "bigint", "code", "text", "income", "bigint",
                "visit", "date"), types("src.coded"));
        assertTrue(notes.toString().contains("code text (the codebook (coded.xml) declares text)"), notes.toString());
        assertTrue(notes.toString().contains("income bigint (the codebook (coded.xml) declares number; every one"
                + " of 2 values is an integer)"), notes.toString());
    }

    @Test
    void aValueTheCodebooksTypeCannotHoldIsRefusedWithItsLineAndNoTableIsLeft() throws Exception {
        Path csv = write("coded.csv", "id,visit\n1,2024-01-01\n2,soon\n");
        DatasetCodebook codebook = new DatasetCodebook("coded.xml", null, List.of(declared("visit", StorageType.DATE)));
        var e = assertThrows(CsvWaveImporter.ImportRefusedException.class, () -> load("src.coded", csv, codebook));
        assertTrue(e.getMessage().contains("coded.csv line 3, column 2 (visit): 'soon' is not a date but the codebook"
                + " (coded.xml) declares date; nothing was imported"), e.getMessage());
        assertEquals(null, text("SELECT to_regclass('src.coded')::text"));
    }

    @Test
    void anExistingTableWithoutOneOfTheFilesColumnsIsRefusedAndNotAltered() throws Exception {
        Map<String, String> before = types("src.answers");
        Path csv = write("wider.csv", "respondent_id,score,region,satisfied,has_car,remark,spread,weight\n"
                + "1,50.5,north,2,true,x,50,1.5\n");
        var e = assertThrows(ConfigException.class, () -> load("src.answers", csv, null));
        assertTrue(e.problem().contains("the header names 'weight' (column 8) match no column of src.answers"),
                e.problem());
        assertTrue(e.problem().contains("the file's column weight is not in the table (to add it: ALTER TABLE"
                + " \"src\".\"answers\" ADD COLUMN \"weight\" double precision)"), e.problem());
        assertTrue(e.problem().contains("never widened or retyped"), e.problem());
        assertEquals(before, types("src.answers"));
        assertEquals("0", text("SELECT count(*) FROM src.answers"));
    }

    @Test
    void anExistingTableThatCannotHoldAColumnsValuesIsRefusedWithTheEvidence() throws Exception {
        Path csv = write("fractions.csv", "respondent_id,satisfied\n1,2\n2,2.5\n");
        var e = assertThrows(ConfigException.class, () -> load("src.answers", csv, null));
        assertTrue(e.problem().contains("column satisfied is integer in the table but the file's values need double"
                + " precision (every one of 2 values is a number; value '2.5' at line 3 is not an integer)"),
                e.problem());
        assertEquals("0", text("SELECT count(*) FROM src.answers"));
    }

    @Test
    void anExistingTableThatHoldsTheFileIsLoadedWithHeaderNamesInAnyCase() throws Exception {
        Path csv = write("fits.csv", "Respondent_ID,Score,Has_Car,Remark\n1,50.5,true,\"\"\n2,,false,\n");
        assertEquals(2, load("src.answers", csv, null).rows());
        assertTrue(notes.toString().contains("table src.answers exists and holds every column of the file"),
                notes.toString());
        assertEquals("1", text("SELECT count(*) FROM src.answers WHERE has_car AND remark = '' AND score = 50.5"));
        assertEquals("1", text("SELECT count(*) FROM src.answers WHERE NOT has_car AND remark IS NULL"
                + " AND score IS NULL"));
    }

    @Test
    void aValueAnExistingColumnCannotTakeIsRefusedWithItsLineAndColumn() throws Exception {
        Path csv = write("flags.csv", "respondent_id,has_car\n1,true\n2,maybe\n");
        var e = assertThrows(CsvWaveImporter.ImportRefusedException.class, () -> load("src.answers", csv, null));
        assertTrue(e.getMessage().contains("flags.csv line 3, column 2 (has_car): invalid input syntax for type"
                + " boolean"), e.getMessage());
    }

    /** What one import printed and loaded. */
    record Created(String notes, long rows) {
    }

    Created createWave(String wave, Path csv) throws Exception {
        StringWriter printed = new StringWriter();
        try (Connection c = TestDatabase.connect(url)) {
            long rows = CsvWaveImporter.load(c, TableName.parse("table", "src.visits"), "wave", wave, csv, false,
                    null, CsvWaveImporter.CsvFormat.detect(), true, null, new PrintWriter(printed, true)).rows();
            return new Created(printed.toString(), rows);
        }
    }

    @Test
    void twoCreatingImportsOfDifferentWavesWaitForOneCreationLockAndOneCreatesTheTable() throws Exception {
        Path first = write("visits-1.csv", "id,income\n1,1200\n2,2.5\n");
        Path second = write("visits-2.csv", "id,income\n3,900\n4,1e3\n5,\n");
        List<Future<Created>> runs = new ArrayList<>();
        ExecutorService pool = Executors.newFixedThreadPool(2);
        boolean bothWaited;
        try (Connection gate = TestDatabase.connect(url); var st = gate.createStatement()) {
            // The gate holds the table-creation lock every import takes (WaveLoad.lockTableCreation), so both
            // imports have found no table before either may create it, whatever the scheduling.
            st.execute("SELECT pg_advisory_lock(hashtext('wavewarden create \"src\".\"visits\"'), 0)");
            runs.add(pool.submit(() -> createWave("w1", first)));
            runs.add(pool.submit(() -> createWave("w2", second)));
            bothWaited = awaitWaiting(url, 2, "advisory", runs);
            st.execute("SELECT pg_advisory_unlock(hashtext('wavewarden create \"src\".\"visits\"'), 0)");
        }
        List<Created> done = new ArrayList<>();
        for (Future<Created> f : runs) {
            done.add(f.get());
        }
        pool.shutdown();
        assertTrue(bothWaited, "an import created the table without the creation lock: " + done);
        assertEquals(1, done.stream().filter(d -> d.notes().contains("created table src.visits")).count(),
                done.toString());
        assertEquals(1, done.stream().filter(d -> d.notes().contains("table src.visits exists and holds every"
                + " column of the file")).count(), done.toString());
        assertEquals(List.of(2L, 3L), done.stream().map(Created::rows).toList());
        assertEquals(2, count("SELECT count(*) FROM src.visits WHERE wave = 'w1'"));
        assertEquals(3, count("SELECT count(*) FROM src.visits WHERE wave = 'w2'"));
    }
}
