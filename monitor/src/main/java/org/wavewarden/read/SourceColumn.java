package org.wavewarden.read;

import org.wavewarden.profile.ColumnType;

/** A column of a source table as the catalog describes it. */
public record SourceColumn(String name, ColumnType type, String postgresType) {
}
