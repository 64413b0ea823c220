package org.wavewarden.load;

import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.Measure;
import org.wavewarden.codebook.StorageType;
import org.wavewarden.codebook.VariableMeta;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.Identifiers.TableName;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.testing.TestDatabase;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.time.LocalDate;
import java.time.LocalDateTime;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Loading a wave from a file with its own dictionary: the table is created from the dictionary on request, a
 * number shown without decimals becomes an integer column only when every value is one, an existing table is never
 * widened or retyped, and a refused or failed load leaves nothing behind. The cases are those of
 * {@code import/household-q1.sav} as R 4.2.2 with haven 2.5.1 reads them back ({@code household-waves.R}).
 */
class CaseImporterTest {

    static final TableName TABLE = new TableName("survey", "household");

    String url;

    @BeforeEach
    void database() {
        url = TestDatabase.freshDatabase("caseimport");
    }

    /** A file's cases held in memory, as a reader of a system file gives them. */
    record ListSource(DatasetCodebook codebook, Iterator<Object[]> rows) implements CaseSource {

        static ListSource of(DatasetCodebook codebook, List<Object[]> rows) {
            return new ListSource(codebook, rows.iterator());
        }

        @Override
        public boolean next(Object[] values) {
            if (!rows.hasNext()) {
                return false;
            }
            Object[] r = rows.next();
            System.arraycopy(r, 0, values, 0, r.length);
            return true;
        }

        @Override
        public void close() {
        }
    }

    static VariableMeta number(String name, String format, int decimals) {
        return new VariableMeta(name, null, StorageType.NUMBER, null, decimals, format, Measure.SCALE, null, null,
                null, null, null);
    }

    static VariableMeta text(String name, int width) {
        return new VariableMeta(name, null, StorageType.TEXT, width, null, "A" + width, Measure.NOMINAL, null, null,
                null, null, null);
    }

    static DatasetCodebook household(String... renamed) {
        Map<String, String> regions = new LinkedHashMap<>();
        regions.put("1", "North");
        regions.put("2", "South");
        regions.put("3", "East");
        regions.put("9", "Refused");
        List<VariableMeta> vars = new ArrayList<>(List.of(
                number("id", "F4.0", 0),
                new VariableMeta("region", "Region of the home", StorageType.NUMBER, null, 0, "F8.0", Measure.NOMINAL,
                        null, regions, List.of(new MissingCodeSpec("9", "Refused")), null, null),
                new VariableMeta("age", "Age in years", StorageType.NUMBER, null, 0, "F3.0", Measure.SCALE, "years",
                        Map.of("-99", "No answer"), null, List.of(new MissingRangeSpec(-99.0, -91.0, "No answer")),
                        null),
                number("income", "F8.2", 2),
                text("tenure", 4),
                number("rooms", "F1.0", 0),
                text("note", 300),
                new VariableMeta("interviewed", null, StorageType.DATE, null, null, "DATE11", Measure.SCALE, null,
                        null, null, null, null),
                new VariableMeta("started", null, StorageType.DATETIME, null, null, "DATETIME20", Measure.SCALE, null,
                        null, null, null, null),
                number("weight", "F8.4", 4)));
        for (int i = 0; i + 1 < renamed.length; i += 2) {
            for (int k = 0; k < vars.size(); k++) {
                VariableMeta v = vars.get(k);
                if (v.name().equals(renamed[i])) {
                    vars.set(k, new VariableMeta(renamed[i + 1], v.label(), v.storage(), v.width(), v.decimals(),
                            v.format(), v.measure(), v.unit(), v.valueLabels(), v.missingCodes(), v.missingRanges(),
                            v.validRange()));
                }
            }
        }
        return new DatasetCodebook("household-q1.sav, SPSS system file", null, vars);
    }

    static Object[] row(double id, double region, double age, Double income, String tenure, double rooms,
                        String note, LocalDate date, LocalDateTime time, double weight) {
        return new Object[] {id, region, age, income, tenure, rooms, note, date, time, weight};
    }

    /** household-q1.sav as haven::read_sav(user_na = TRUE) gives it. */
    static List<Object[]> q1() {
        return List.of(
                row(1, 1, 34, 1510.25, "OWN", 3, "a".repeat(300), LocalDate.of(2025, 1, 6),
                        LocalDateTime.of(2025, 1, 6, 9, 15, 0), 0.8125),
                row(2, 2, 51, 2380.5, "RENT", 2.5, "b".repeat(300), LocalDate.of(2025, 1, 7),
                        LocalDateTime.of(2025, 1, 7, 18, 40, 30), 1.25),
                row(3, 3, -99, null, "COUN", 4, "c".repeat(300), LocalDate.of(2025, 1, 7),
                        LocalDateTime.of(2025, 1, 7, 12, 0, 0), 1),
                row(4, 9, 27, 990.0, "OWN", 1, "d".repeat(300), LocalDate.of(2025, 2, 11),
                        LocalDateTime.of(2025, 2, 11, 8, 5, 0), 0.9375),
                row(5, 1, 68, 3100.75, "COUN", 5, "e".repeat(300), LocalDate.of(2025, 3, 1),
                        LocalDateTime.of(2025, 3, 1, 17, 30, 0), 1.5),
                row(6, 2, -92, 1800.0, "RENT", 2, "f".repeat(300), null, null, 0.5));
    }

    record Run(CaseImporter.Loaded loaded, String notes) {
    }

    Run load(String wave, DatasetCodebook codebook, List<Object[]> rows, boolean replace, boolean create)
            throws Exception {
        StringWriter notes = new StringWriter();
        try (Connection c = TestDatabase.connect(url)) {
            var loaded = CaseImporter.loadWithCodebook(c, TABLE, "wave", wave, ListSource.of(codebook, rows),
                    replace, create, new PrintWriter(notes), null);
            return new Run(loaded, notes.toString());
        }
    }

    long count(String sql) throws SQLException {
        try (Connection c = TestDatabase.connect(url); ResultSet rs = c.createStatement().executeQuery(sql)) {
            rs.next();
            return rs.getLong(1);
        }
    }

    Map<String, String> columns() throws SQLException {
        try (Connection c = TestDatabase.connect(url)) {
            return TableShape.existing(c, TABLE);
        }
    }

    void execute(String sql) throws SQLException {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute(sql);
        }
    }

    @Test
    void createTypesEachColumnFromTheDictionaryAndTheValuesAndPrintsWhy() throws Exception {
        Run r = load("2025-Q1", household(), q1(), false, true);
        assertEquals(6, r.loaded().imported().rows());
        Map<String, String> expected = new LinkedHashMap<>();
        expected.put("wave", "text");
        expected.put("id", "bigint");
        expected.put("region", "bigint");
        expected.put("age", "bigint");
        expected.put("income", "double precision");
        expected.put("tenure", "text");
        expected.put("rooms", "double precision");
        expected.put("note", "text");
        expected.put("interviewed", "date");
        expected.put("started", "timestamp without time zone");
        expected.put("weight", "double precision");
        assertEquals(expected, columns());
        assertTrue(r.notes().contains("created table survey.household with 11 columns and an index on wave"),
                r.notes());
        assertTrue(r.notes().contains("age bigint (SPSS format F3.0, every value an integer)"), r.notes());
        assertTrue(r.notes().contains("rooms double precision (SPSS format F1.0, but 2.5 is not an integer)"),
                r.notes());
        assertTrue(r.notes().contains("income double precision (SPSS format F8.2)"), r.notes());
        assertTrue(r.notes().contains("started timestamp (SPSS format DATETIME20)"), r.notes());
        assertEquals(1, count("SELECT count(*) FROM pg_indexes WHERE schemaname = 'survey' AND tablename = 'household'"
                + " AND indexdef LIKE '%(wave)%'"));
        assertEquals(1, count("SELECT count(*) FROM pg_attribute WHERE attrelid = 'survey.household'::regclass"
                + " AND attname = 'wave' AND attnotnull"));
    }

    @Test
    void everyValueArrivesAsTheFileHoldsIt() throws Exception {
        load("2025-Q1", household(), q1(), false, true);
        List<String> got = new ArrayList<>();
        try (Connection c = TestDatabase.connect(url); ResultSet rs = c.createStatement().executeQuery(
                "SELECT wave, id, region, age, income, tenure, rooms, length(note), left(note, 2), interviewed,"
                        + " started, weight FROM survey.household ORDER BY id")) {
            while (rs.next()) {
                List<String> cells = new ArrayList<>();
                for (int i = 1; i <= 12; i++) {
                    cells.add(rs.getString(i));
                }
                got.add(String.join("|", cells));
            }
        }
        assertEquals(List.of(
                "2025-Q1|1|1|34|1510.25|OWN|3|300|aa|2025-01-06|2025-01-06 09:15:00|0.8125",
                "2025-Q1|2|2|51|2380.5|RENT|2.5|300|bb|2025-01-07|2025-01-07 18:40:30|1.25",
                "2025-Q1|3|3|-99|null|COUN|4|300|cc|2025-01-07|2025-01-07 12:00:00|1",
                "2025-Q1|4|9|27|990|OWN|1|300|dd|2025-02-11|2025-02-11 08:05:00|0.9375",
                "2025-Q1|5|1|68|3100.75|COUN|5|300|ee|2025-03-01|2025-03-01 17:30:00|1.5",
                "2025-Q1|6|2|-92|1800|RENT|2|300|ff|null|null|0.5"), got);
    }

    @Test
    void aSecondWaveGoesIntoTheCreatedTableMatchingNamesWithoutRegardToCase() throws Exception {
        load("2025-Q1", household(), q1(), false, true);
        Run second = load("2025-Q2", household("region", "REGION", "age", "Age"), List.<Object[]>of(
                row(7, 3, 45, 2210.0, "RENT", 2, "g", LocalDate.of(2025, 4, 2),
                        LocalDateTime.of(2025, 4, 2, 10, 0, 0), 1)), false, false);
        assertEquals(1, second.loaded().imported().rows());
        assertTrue(second.notes().contains("variable REGION -> column region"), second.notes());
        assertTrue(second.notes().contains("table survey.household exists and holds every column of the file"),
                second.notes());
        assertEquals(45, count("SELECT age FROM survey.household WHERE wave = '2025-Q2'"));
        assertEquals(7, count("SELECT count(*) FROM survey.household"));
        assertEquals(List.of("region", "age"), second.loaded().codebook().variables().stream()
                .map(VariableMeta::name).filter(n -> n.equals("region") || n.equals("age")).toList());
    }

    @Test
    void theSavedDictionaryNamesEachVariableAsItsColumnAndKeepsLabelsAndMissingValues() throws Exception {
        Run r = load("2025-Q1", household("region", "Region.Of.Home"), q1(), false, true);
        DatasetCodebook saved = r.loaded().codebook();
        VariableMeta region = saved.variable("region_of_home").orElseThrow();
        assertEquals("region_of_home", region.name());
        assertEquals("Refused", region.valueLabels().get("9"));
        assertEquals(List.of(new MissingCodeSpec("9", "Refused")), region.missingCodes());
        assertEquals(List.of(new MissingRangeSpec(-99.0, -91.0, "No answer")),
                saved.variable("age").orElseThrow().missingRanges());
        assertTrue(r.notes().contains("variable Region.Of.Home -> column region_of_home"), r.notes());
    }

    @Test
    void aMissingTableWithoutCreateIsRefusedSuggestingCreateAndNothingIsMade() throws Exception {
        ConfigException e = assertThrows(ConfigException.class, () -> load("2025-Q1", household(), q1(), false,
                false));
        assertEquals("table", e.key());
        assertTrue(e.problem().contains("--create"), e.problem());
        assertEquals(0, count("SELECT count(*) FROM pg_class WHERE relname = 'household'"));
    }

    @Test
    void anExistingTableLackingAVariableIsRefusedWithTheNearestColumnAndNothingImported() throws Exception {
        load("2025-Q1", household(), q1(), false, true);
        ConfigException e = assertThrows(ConfigException.class, () -> load("2025-Q2",
                household("income", "incomes", "tenure", "pets"), q1(), false, false));
        assertEquals("table", e.key());
        assertTrue(e.problem().contains("incomes (did you mean income?)"), e.problem());
        assertTrue(e.problem().contains("pets") && e.problem().contains("never widened"), e.problem());
        assertEquals(0, count("SELECT count(*) FROM survey.household WHERE wave = '2025-Q2'"));
        assertFalse(columns().containsKey("incomes"));
    }

    @Test
    void aFractionForAnIntegerColumnIsRefusedAndTheTableIsNotRetyped() throws Exception {
        execute("CREATE SCHEMA survey; CREATE TABLE survey.household (wave text NOT NULL, id integer,"
                + " region integer, age integer, income numeric, tenure text, rooms integer, note text,"
                + " interviewed date, started timestamp, weight double precision)");
        ConfigException e = assertThrows(ConfigException.class, () -> load("2025-Q1", household(), q1(), false,
                false));
        assertTrue(e.problem().contains("column rooms is integer in the table but the file's values need double"
                + " precision (SPSS format F1.0, but 2.5 is not an integer)"), e.problem());
        assertEquals("integer", columns().get("rooms"));
        assertEquals(0, count("SELECT count(*) FROM survey.household"));
    }

    @Test
    void aWaveLoadedTwiceIsRefusedUnlessReplacedAndReplacingLeavesOnlyTheNewRows() throws Exception {
        load("2025-Q1", household(), q1(), false, true);
        ConfigException e = assertThrows(ConfigException.class, () -> load("2025-Q1", household(), q1(), false,
                true));
        assertEquals("--wave", e.key());
        assertTrue(e.problem().contains("already has 6 rows") && e.problem().contains("--replace"), e.problem());
        Run again = load("2025-Q1", household(), q1().subList(0, 2), true, true);
        assertEquals(2, again.loaded().imported().rows());
        assertEquals(2, count("SELECT count(*) FROM survey.household WHERE wave = '2025-Q1'"));
    }

    @Test
    void aCaseTheServerRefusesNamesTheCaseAndColumnAndLeavesNoTableBehind() throws Exception {
        List<Object[]> rows = new ArrayList<>(q1());
        Object[] bad = Arrays.copyOf(rows.get(3), 10);
        bad[4] = "OW\u0000N";
        rows.set(3, bad);
        CsvWaveImporter.ImportRefusedException e = assertThrows(CsvWaveImporter.ImportRefusedException.class,
                () -> load("2025-Q1", household(), rows, false, true));
        assertTrue(e.getMessage().startsWith("household-q1.sav, SPSS system file case 4, column tenure: "),
                e.getMessage());
        assertTrue(e.getMessage().endsWith("nothing was imported"), e.getMessage());
        assertEquals(0, count("SELECT count(*) FROM pg_class WHERE relname = 'household'"));
    }

    @Test
    void aFileWithNoCasesIsRefusedAndCreatesNoTable() throws Exception {
        CsvWaveImporter.ImportRefusedException e = assertThrows(CsvWaveImporter.ImportRefusedException.class,
                () -> load("2025-Q1", household(), List.of(), false, true));
        assertTrue(e.getMessage().contains("has no cases"), e.getMessage());
        assertEquals(0, count("SELECT count(*) FROM pg_class WHERE relname = 'household'"));
    }

    @Test
    void twoVariablesThatWouldShareAColumnAreRefused() throws Exception {
        CsvWaveImporter.ImportRefusedException e = assertThrows(CsvWaveImporter.ImportRefusedException.class,
                () -> load("2025-Q1", household("income", "room.s", "rooms", "room_s"), q1(), false, true));
        assertTrue(e.getMessage().contains("room.s and room_s") && e.getMessage().contains("column room_s"),
                e.getMessage());
    }

    @Test
    void theFilesOwnWaveVariableGivesWayToTheWaveLabel() throws Exception {
        Run r = load("2025-Q1", household("id", "WAVE"), q1(), false, true);
        assertTrue(r.notes().contains("the file's variable WAVE is the wave column"), r.notes());
        assertEquals("text", columns().get("wave"));
        assertEquals(6, count("SELECT count(*) FROM survey.household WHERE wave = '2025-Q1'"));
        assertTrue(r.loaded().codebook().variable("wave").isEmpty());
    }

    @Test
    void aWaveTheWaveColumnCannotHoldIsRefusedNamingTheOption() throws Exception {
        execute("CREATE SCHEMA survey; CREATE TABLE survey.household (wave integer NOT NULL, id bigint,"
                + " region bigint, age bigint, income double precision, tenure text, rooms double precision,"
                + " note text, interviewed date, started timestamp, weight double precision)");
        ConfigException e = assertThrows(ConfigException.class, () -> load("2025-Q1", household(), q1(), false,
                false));
        assertEquals("--wave", e.key());
        load("202501", household(), q1(), false, false);
        assertEquals(6, count("SELECT count(*) FROM survey.household WHERE wave = 202501"));
    }

    @Test
    void anExistingTableWithoutTheWaveColumnIsRefusedNamingTheKey() throws Exception {
        execute("CREATE SCHEMA survey; CREATE TABLE survey.household (round text, id bigint)");
        ConfigException e = assertThrows(ConfigException.class, () -> load("2025-Q1", household(), q1(), false,
                true));
        assertEquals("waveColumn", e.key());
        assertEquals(0, count("SELECT count(*) FROM survey.household"));
    }

    @Test
    void aLargeWaveIsStreamedInBlocksWithTextLongerThanABlock() throws Exception {
        List<Object[]> rows = new ArrayList<>();
        for (int i = 0; i < 20_000; i++) {
            Object[] r = Arrays.copyOf(q1().get(i % 6), 10);
            r[0] = (double) i;
            rows.add(r);
        }
        rows.get(12_345)[6] = "x".repeat(200_000);
        Run r = load("2025-Q1", household(), rows, false, true);
        assertEquals(20_000, r.loaded().imported().rows());
        assertEquals(200_000, count("SELECT length(note) FROM survey.household WHERE id = 12345"));
        assertEquals(19_999L * 20_000 / 2, count("SELECT sum(id) FROM survey.household"));
    }

    @Test
    void twoImportsCreatingOneTableForDifferentWavesBothLoad() throws Exception {
        List<Future<Run>> runs = new ArrayList<>();
        ExecutorService pool = Executors.newFixedThreadPool(2);
        try (Connection gate = TestDatabase.connect(url); var st = gate.createStatement()) {
            // The gate holds the creation lock, so both imports have found no table before either may create it.
            st.execute("SELECT pg_advisory_lock(hashtext('wavewarden create \"survey\".\"household\"'), 0)");
            runs.add(pool.submit(() -> load("2025-Q1", household(), q1(), false, true)));
            runs.add(pool.submit(() -> load("2025-Q2", household(), q1(), false, true)));
            SmallSurveyImportTest.awaitWaiting(url, 2, "advisory", runs);
            st.execute("SELECT pg_advisory_unlock(hashtext('wavewarden create \"survey\".\"household\"'), 0)");
        }
        List<Boolean> created = new ArrayList<>();
        for (Future<Run> f : runs) {
            created.add(f.get().notes().contains("created table"));
        }
        pool.shutdown();
        assertEquals(1, created.stream().filter(b -> b).count(), created.toString());
        assertEquals(12, count("SELECT count(*) FROM survey.household"));
    }
}
