package org.wavewarden.judge;

import org.wavewarden.profile.SchemaChanges;

import java.util.List;

/** A data-quality finding per column added, retyped or dropped ({@link SchemaChanges}). */
public final class SchemaFindings {

    private SchemaFindings() {
    }

    public static List<Finding> of(List<SchemaChanges.Change> changes) {
        return changes.stream().map(SchemaFindings::of).toList();
    }

    static Finding of(SchemaChanges.Change c) {
        return switch (c.kind()) {
            case ADDED -> Finding.dataQuality(c.column(), FindingKind.COLUMN_ADDED, null, null, "Column " + c.column()
                    + " is new in this wave.", null);
            case RETYPED -> Finding.dataQuality(c.column(), FindingKind.COLUMN_RETYPED, null, null, "Column "
                    + c.column() + " changed type from " + c.before() + " to " + c.after() + ".", null);
            case DROPPED -> Finding.dataQuality(c.column(), FindingKind.COLUMN_DROPPED, null, null, "Column "
                    + c.column() + " of the baseline is missing from this wave.", null);
        };
    }
}
