package org.wavewarden.read;

import org.jdbi.v3.core.Handle;
import org.jdbi.v3.core.Jdbi;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.wavewarden.config.Identifiers.TableName;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.testing.TestDatabase;

import java.util.List;
import java.util.Map;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The binary scanner must give exactly what the text scanner gives (the text path is the reference: it is what
 * PostgreSQL's output functions print) on tables with every kind of column and the odd values surveys contain.
 */
class BinaryWaveScannerTest {

    static Jdbi jdbi;
    static Handle h;

    @BeforeAll
    static void setUp() {
        String url = TestDatabase.freshDatabase("binscan");
        jdbi = Jdbi.create(url, "postgres", "");
        h = jdbi.open();
        h.execute("""
                CREATE SCHEMA src;
                CREATE DOMAIN src.yes_no AS boolean;
                CREATE TYPE src.pair AS (a integer, b text);
                CREATE TABLE src.mixed (
                    wave text, i2 smallint, i4 integer, i8 bigint, f4 real, f8 double precision, n numeric,
                    n2 numeric(12,3), b boolean, d date, t text, vc varchar(400), ch char(5), ts timestamp,
                    tz timestamptz, iv interval, ip inet, arr integer[], js jsonb, yn src.yes_no, pr src.pair,
                    u uuid
                );
                """);
        // Values a text scanner sees in a peculiar form: escapes, padding, exponents, signed zeros, BC dates.
        h.execute("""
                INSERT INTO src.mixed VALUES
                ('edge', 0, 0, 0, 0, 0, 0, 0, true, '2000-01-01', '', '', '', '2000-01-01 00:00', '2000-01-01 00:00+00',
                 '0', '1.2.3.4', '{}', '{}', true, ROW(NULL, NULL), '00000000-0000-0000-0000-000000000000'),
                ('edge', -32768, -2147483648, -9223372036854775808, '-0', '-0', '-0.00', '-0.5', false,
                 '0044-03-15 BC', 'tab\there', 'new
                line', 'a', '1999-12-31 23:59:59.999999', '1970-01-01 00:00+05', '-1 day 02:03:04', '10.0.0.0/8',
                 '{1,NULL,3}', '{"a": [1, "x"]}', false, ROW(1, 'x y'), 'a0eebc99-9c0b-4ef8-bb6d-6bb9bd380a11'),
                ('edge', 32767, 2147483647, 9223372036854775807, 'NaN', 'NaN', 'NaN', '123456789.123', NULL,
                 '4713-01-01 BC', 'back\\slash', repeat('x', 256), 'abcde', 'infinity', '-infinity', '1 mon',
                 '::1', NULL, 'null', NULL, NULL, NULL),
                ('edge', NULL, NULL, NULL, 'Infinity', 'Infinity', 'Infinity', NULL, NULL, 'infinity', repeat('y', 257),
                 repeat('é', 200), NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL),
                ('edge', 1, 1, 1, '-Infinity', '-Infinity', '-Infinity', 0.001, true, '-infinity',
                 repeat('long value ', 60), repeat('é', 257), 'é', NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL),
                ('edge', 2, 2, 2, '1e20', '1e20', 1e20, 1e8, true, '5874897-12-31', repeat('long value ', 60),
                 ' ', ' x', NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL),
                ('edge', 3, 3, 3, '0.1', '0.1', 0.1, 0.1, true, '10000-01-01', E'\\\\N', 'ü€😀', '😀',
                 NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL),
                ('edge', 4, 4, 4, '1e15', '1e15', 1e-30, 1.5, true, '1999-12-31', 'NULL', E'\\r\\n', NULL,
                 NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL),
                ('edge', 5, 5, 5, '1e14', '1e14', repeat('9', 300)::numeric, 2.25, true, '2000-02-29', 'NULL', NULL, NULL,
                 NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL),
                ('edge', 6, 6, 6, '123456', '100000000000000', repeat('9', 300)::numeric + 1, 0, true, '1900-02-28',
                 '', NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL),
                ('edge', 7, 7, 7, '999999', '1e-4', 0.00010, 0.0005, true, '0001-01-01', '', NULL, NULL,
                 NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL),
                ('edge', 8, 8, 8, '1e-5', '1e-5', -12345678901234567890.123456789, -0.0005, true, '0001-12-31 BC',
                 '', NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL),
                ('edge', 9, 9, 9, '3.4028235e38', '1.7976931348623157e308', 10000, 10000, true, '1582-10-04', '', NULL,
                 NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL),
                ('edge', 10, 10, 10, '1.4e-45', '4.9e-324', 0.0000, 99999.999, true, '1582-10-15', '', NULL, NULL,
                 NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL),
                ('edge', 11, 11, 11, '1.17549435e-38', '2.2250738585072014e-308', 1.10, 1.100, true, '2024-02-29',
                 '', NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL),
                ('edge', 12, 12, 12, '0.3', '0.30000000000000004', 123.4500, 5, true, '2100-03-01', '', NULL,
                 NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL),
                ('edge', 13, 13, 13, '16777216', '9007199254740993', 1.0e-7, 7, true, '1970-01-01', '', NULL, NULL,
                 NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL, NULL),
                ('edge', 14, 14, 14, '1e6', '2e23', 'NaN', 8, true, '1969-12-31', '', NULL, NULL, NULL, NULL, NULL,
                 NULL, NULL, NULL, NULL, NULL, NULL)
                """);
        // Many rows and many distinct values, generated on the server from a fixed seed.
        h.execute("SELECT setseed(0.25)");
        h.execute("""
                INSERT INTO src.mixed
                SELECT 'bulk',
                       CASE WHEN random() < 0.05 THEN NULL ELSE (random() * 200 - 100)::int END,
                       CASE WHEN random() < 0.05 THEN -9 ELSE 18 + (random() * 70)::int END,
                       (random() * 1e12)::bigint,
                       (random() * 1000)::real,
                       CASE WHEN random() < 0.03 THEN 'NaN'::float8 WHEN random() < 0.5 THEN round((random() * 100)::numeric, 1)::float8
                            ELSE exp(random() * 80 - 40) * (CASE WHEN random() < 0.5 THEN -1 ELSE 1 END) END,
                       round((random() * 1e6)::numeric, (random() * 4)::int),
                       (random() * 1e6)::numeric(12,3),
                       CASE WHEN random() < 0.1 THEN NULL ELSE random() < 0.4 END,
                       DATE '2020-01-01' + (random() * 2000)::int,
                       CASE WHEN random() < 0.1 THEN NULL WHEN random() < 0.1 THEN '' ELSE md5(random()::text) END,
                       (ARRAY['north', 'south', ' east', 'west ', 'n/a', ''])[1 + (random() * 5)::int],
                       (ARRAY['a', 'bb', 'ccc'])[1 + (random() * 2)::int],
                       TIMESTAMP '2024-01-01' + random() * INTERVAL '30 days',
                       TIMESTAMPTZ '2024-01-01 00:00+00' + (random() * 100)::int * INTERVAL '1 hour',
                       (random() * 100)::int * INTERVAL '1 minute',
                       ('10.0.' || (random() * 3)::int || '.' || (random() * 3)::int)::inet,
                       ARRAY[(random() * 3)::int, (random() * 3)::int],
                       jsonb_build_object('k', (random() * 3)::int),
                       random() < 0.5,
                       ROW((random() * 3)::int, NULL)::src.pair,
                       NULL
                FROM generate_series(1, 8000)
                """);
        // Every float8 bit pattern class in one place: random doubles of every exponent.
        Random r = new Random(7);
        var batch = h.prepareBatch("INSERT INTO src.mixed (wave, f8, f4) VALUES ('floats', :f8, :f4)");
        for (int i = 0; i < 3000; i++) {
            double d = Double.longBitsToDouble(r.nextLong());
            float f = Float.intBitsToFloat(r.nextInt());
            batch.bind("f8", Double.isNaN(d) ? 1.0 : d).bind("f4", Float.isNaN(f) ? 1.0f : f).add();
        }
        batch.execute();
    }

    @AfterAll
    static void tearDown() {
        h.close();
    }

    static List<SourceColumn> columns() {
        return SourceCatalog.columns(h, TableName.parse("table", "src.mixed")).stream()
                .filter(c -> !c.name().equals("wave")).toList();
    }

    static WaveSource source() {
        return new WaveSource(TableName.parse("table", "src.mixed"), "wave", null);
    }

    static void assertSameScan(String wave, int maxDistinct) {
        List<SourceColumn> cols = columns();
        WaveScanner.WaveScan text = new TextWaveScanner(maxDistinct).scan(h, source(), wave, cols, null);
        WaveScanner.WaveScan binary = new BinaryWaveScanner(maxDistinct).scan(h, source(), wave, cols, null);
        assertEquals(text.rows(), binary.rows());
        assertEquals(text.columns().keySet(), binary.columns().keySet());
        for (String c : text.columns().keySet()) {
            ColumnTally t = text.columns().get(c);
            ColumnTally b = binary.columns().get(c);
            assertEquals(t.nullCount(), b.nullCount(), c);
            assertEquals(t.truncated(), b.truncated(), c);
            if (!t.valueCounts().equals(b.valueCounts())) {
                Map<String, Long> onlyText = new java.util.TreeMap<>(t.valueCounts());
                onlyText.entrySet().removeAll(b.valueCounts().entrySet());
                Map<String, Long> onlyBinary = new java.util.TreeMap<>(b.valueCounts());
                onlyBinary.entrySet().removeAll(t.valueCounts().entrySet());
                throw new AssertionError("column " + c + ": text has " + first(onlyText) + ", binary has "
                        + first(onlyBinary));
            }
            assertEquals(t, b, c);
        }
    }

    private static String first(Map<String, Long> m) {
        return m.entrySet().stream().limit(8).toList().toString();
    }

    @Test
    void edgeValuesTallyExactlyAsTheTextScannerTalliesThem() {
        assertSameScan("edge", WaveScanner.DEFAULT_MAX_DISTINCT);
    }

    @Test
    void generatedWaveTalliesExactlyAsTheTextScannerTalliesIt() {
        assertSameScan("bulk", WaveScanner.DEFAULT_MAX_DISTINCT);
    }

    @Test
    void randomBitPatternsOfEveryExponentPrintAsTheServerPrintsThem() {
        assertSameScan("floats", WaveScanner.DEFAULT_MAX_DISTINCT);
    }

    @Test
    void capOnDistinctValuesTruncatesTheSameColumnsAtTheSameValues() {
        assertSameScan("bulk", 50);
        WaveScanner.WaveScan b = new BinaryWaveScanner(50).scan(h, source(), "bulk", columns(), null);
        assertTrue(b.columns().get("t").truncated());
        assertEquals(50, b.columns().get("t").distinctCount());
        assertFalse(b.columns().get("b").truncated());
    }

    @Test
    void pairTalliesEqualTheTextScannersToTheLastBit() {
        // Every numeric type against every other, with NULLs, NaN, infinities, -0 and 300-digit numerics.
        List<PairSpec> pairs = List.of(new PairSpec("i4", "f8"), new PairSpec("f4", "n"), new PairSpec("i2", "n2"),
                new PairSpec("i8", "f4"), new PairSpec("f8", "n"));
        for (String wave : List.of("edge", "bulk", "floats")) {
            WaveScanner.WaveScan text = new TextWaveScanner(WaveScanner.DEFAULT_MAX_DISTINCT)
                    .scan(h, source(), wave, columns(), null, null, pairs, null);
            WaveScanner.WaveScan binary = new BinaryWaveScanner(WaveScanner.DEFAULT_MAX_DISTINCT)
                    .scan(h, source(), wave, columns(), null, null, pairs, null);
            assertEquals(pairs.size(), binary.pairs().size());
            assertEquals(text.pairs(), binary.pairs(), wave);
            assertEquals(text, binary, wave);
        }
    }

    @Test
    void aWaveWithoutColumnsCountsItsRows() {
        WaveScanner.WaveScan b = new BinaryWaveScanner(10).scan(h, source(), "edge", List.of(), null);
        WaveScanner.WaveScan t = new TextWaveScanner(10).scan(h, source(), "edge", List.of(), null);
        assertEquals(t, b);
        assertEquals(18, b.rows());
    }

    @Test
    void oneTablePerWaveIsReadToo() {
        h.execute("CREATE TABLE src.w_2024 AS SELECT i4, f8, t, d FROM src.mixed WHERE wave = 'bulk'");
        WaveSource perWave = new WaveSource(null, null, "src.w_{wave}");
        List<SourceColumn> cols = SourceCatalog.columns(h, perWave.tableFor("2024"));
        assertEquals(new TextWaveScanner(1000).scan(h, perWave, "2024", cols, null), // capped: f8 and t truncate
                new BinaryWaveScanner(1000).scan(h, perWave, "2024", cols, null));
    }

    @Test
    void theConnectionIsUsableAfterAScan() {
        new BinaryWaveScanner(10).scan(h, source(), "edge", columns(), null);
        assertEquals(1, h.createQuery("SELECT 1").mapTo(Integer.class).one());
    }
}
