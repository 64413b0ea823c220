package org.wavewarden.read;

import org.junit.jupiter.api.Test;
import org.wavewarden.config.Identifiers.TableName;

import static org.junit.jupiter.api.Assertions.assertEquals;

/** The FROM/WHERE text the wave scanners and the pair reader run: quoted identifiers, escaped labels. */
class WaveSourceTest {

    static final TableName PUB = new TableName("src", "pub");

    @Test
    void withoutAReleaseColumnAWaveIsAllItsRows() {
        assertEquals(" FROM \"src\".\"pub\" WHERE \"wave\"::text = 'w1'",
                new WaveSource(PUB, "wave", null).fromClause("w1"));
        assertEquals(" FROM \"src\".\"w_2025\"", new WaveSource(null, null, "src.w_{wave}").fromClause("2025"));
    }

    @Test
    void withAReleaseColumnAWaveIsItsGreatestRelease() {
        assertEquals(" FROM \"src\".\"pub\" WHERE \"wave\"::text = 'w1' AND \"release\" = (SELECT max(r.\"release\")"
                        + " FROM \"src\".\"pub\" r WHERE r.\"wave\"::text = 'w1')",
                new WaveSource(PUB, "wave", null, "release").fromClause("w1"));
        assertEquals(" FROM \"src\".\"w_2025\" WHERE \"release\" = (SELECT max(r.\"release\")"
                        + " FROM \"src\".\"w_2025\" r)",
                new WaveSource(null, null, "src.w_{wave}", "release").fromClause("2025"));
    }

    @Test
    void oneReleaseIsSelectedByItsTextForm() {
        assertEquals(" FROM \"src\".\"pub\" WHERE \"wave\"::text = 'w1' AND \"release\"::text = '2'",
                new WaveSource(PUB, "wave", null, "release").fromClause("w1", "2"));
    }

    @Test
    void labelsFromTheSourceAreEscapedAsLiterals() {
        assertEquals(" FROM \"src\".\"pub\" WHERE \"wave\"::text = 'it''s' AND \"release\"::text = 'x'' OR ''1''=''1'",
                new WaveSource(PUB, "wave", null, "release").fromClause("it's", "x' OR '1'='1"));
    }
}
