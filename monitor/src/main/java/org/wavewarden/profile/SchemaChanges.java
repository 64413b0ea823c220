package org.wavewarden.profile;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;

/**
 * How a wave's columns differ from its baseline's: columns added, retyped (their storage class changed) and
 * dropped, in the current wave's column order and then the baseline's.
 */
public final class SchemaChanges {

    private SchemaChanges() {
    }

    /** What happened to a column between the baseline and the current wave. */
    public enum Kind { ADDED, RETYPED, DROPPED }

    /** One column's change; {@code before} is null for an added column, {@code after} for a dropped one. */
    public record Change(String column, Kind kind, ColumnType before, ColumnType after) {
    }

    /** The changes from a baseline's schema to a current one; none without a baseline. */
    public static List<Change> between(WaveProfile baseline, WaveProfile current) {
        return baseline == null ? List.of() : between(baseline.schema(), current.schema());
    }

    public static List<Change> between(Map<String, ColumnType> baseline, Map<String, ColumnType> current) {
        List<Change> out = new ArrayList<>();
        current.forEach((column, type) -> {
            ColumnType before = baseline.get(column);
            if (before == null) {
                out.add(new Change(column, Kind.ADDED, null, type));
            } else if (before != type) {
                out.add(new Change(column, Kind.RETYPED, before, type));
            }
        });
        baseline.forEach((column, type) -> {
            if (!current.containsKey(column)) {
                out.add(new Change(column, Kind.DROPPED, type, null));
            }
        });
        return out;
    }
}
