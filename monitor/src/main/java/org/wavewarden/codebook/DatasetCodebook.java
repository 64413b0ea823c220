package org.wavewarden.codebook;

import java.util.List;
import java.util.Locale;
import java.util.Optional;

/**
 * A dataset's codebook: its variables in file order, with where it came from.
 *
 * @param source    what was read, for messages and the merge report ("household-2025-Q1.sav, SPSS system file")
 * @param title     the file or study label, when there is one
 * @param variables every variable the codebook describes, in its order
 */
public record DatasetCodebook(String source, String title, List<VariableMeta> variables) {

    public DatasetCodebook {
        variables = variables == null ? List.of() : List.copyOf(variables);
    }

    /** The variable of that name, matched without regard to case (SPSS names are case-insensitive). */
    public Optional<VariableMeta> variable(String name) {
        for (VariableMeta v : variables) {
            if (v.name().equals(name)) {
                return Optional.of(v);
            }
        }
        String lower = name.toLowerCase(Locale.ROOT);
        return variables.stream().filter(v -> v.name().toLowerCase(Locale.ROOT).equals(lower)).findFirst();
    }
}
