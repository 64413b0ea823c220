package org.wavewarden.read;

import org.jdbi.v3.core.Handle;
import org.wavewarden.config.Identifiers;

import java.util.List;

/** Lists the releases of one wave kept side by side in a release column. */
public final class ReleaseListing {

    private ReleaseListing() {
    }

    /**
     * The wave's release labels (text form), earliest first in the column's own sort order, the order in which
     * {@link WaveSource#fromClause(String)} takes the greatest as the published release. Rows with a NULL release
     * belong to none.
     */
    public static List<String> releases(Handle h, WaveSource source, String wave) {
        if (source.releaseColumn() == null) {
            throw new IllegalArgumentException("the source has no release column");
        }
        String rc = Identifiers.quote(source.releaseColumn());
        String where = source.onePerWave() ? "" : Identifiers.quote(source.waveColumn()) + "::text = :wave AND ";
        var q = h.createQuery("SELECT x.label FROM (SELECT DISTINCT " + rc + " AS o, " + rc + "::text AS label FROM "
                + source.tableFor(wave).quoted() + " WHERE " + where + rc + " IS NOT NULL) x ORDER BY x.o");
        if (!source.onePerWave()) {
            q.bind("wave", wave);
        }
        return q.mapTo(String.class).list();
    }
}
