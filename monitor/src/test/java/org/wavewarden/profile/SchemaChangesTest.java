package org.wavewarden.profile;

import org.junit.jupiter.api.Test;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;

class SchemaChangesTest {

    private static Map<String, ColumnType> schema(Object... nameType) {
        Map<String, ColumnType> m = new LinkedHashMap<>();
        for (int i = 0; i < nameType.length; i += 2) {
            m.put((String) nameType[i], (ColumnType) nameType[i + 1]);
        }
        return m;
    }

    @Test
    void addedAndRetypedColumnsComeInTheCurrentOrderThenDroppedOnesInTheBaselineOrder() {
        var baseline = schema("id", ColumnType.INTEGER, "age", ColumnType.INTEGER, "region", ColumnType.TEXT,
                "income", ColumnType.DECIMAL);
        var current = schema("id", ColumnType.INTEGER, "mode", ColumnType.TEXT, "age", ColumnType.TEXT,
                "score", ColumnType.DECIMAL);
        assertEquals(List.of(
                new SchemaChanges.Change("mode", SchemaChanges.Kind.ADDED, null, ColumnType.TEXT),
                new SchemaChanges.Change("age", SchemaChanges.Kind.RETYPED, ColumnType.INTEGER, ColumnType.TEXT),
                new SchemaChanges.Change("score", SchemaChanges.Kind.ADDED, null, ColumnType.DECIMAL),
                new SchemaChanges.Change("region", SchemaChanges.Kind.DROPPED, ColumnType.TEXT, null),
                new SchemaChanges.Change("income", SchemaChanges.Kind.DROPPED, ColumnType.DECIMAL, null)),
                SchemaChanges.between(baseline, current));
    }

    @Test
    void anUnchangedSchemaHasNoChangesWhateverItsOrder() {
        assertEquals(List.of(), SchemaChanges.between(schema("a", ColumnType.DATE, "b", ColumnType.BOOLEAN),
                schema("b", ColumnType.BOOLEAN, "a", ColumnType.DATE)));
    }

    @Test
    void aFirstWaveHasNoBaselineAndSoNoChanges() {
        WaveProfile first = new WaveProfile("2024-01", 3, schema("a", ColumnType.TEXT), Map.of());
        assertEquals(List.of(), SchemaChanges.between(null, first));
    }

    @Test
    void swappingTheWavesTurnsAddedIntoDroppedAndReversesARetyping() {
        var a = schema("x", ColumnType.INTEGER, "y", ColumnType.TEXT);
        var b = schema("x", ColumnType.DECIMAL, "z", ColumnType.TEXT);
        for (SchemaChanges.Change c : SchemaChanges.between(a, b)) {
            SchemaChanges.Change back = SchemaChanges.between(b, a).stream()
                    .filter(o -> o.column().equals(c.column())).findFirst().orElseThrow();
            assertEquals(c.before(), back.after());
            assertEquals(c.after(), back.before());
        }
    }
}
