package org.wavewarden.codebook;

import org.wavewarden.config.VariableConfig;

import java.util.List;

/** A dataset's YAML variables merged with a codebook: the YAML wins, the codebook fills what it leaves out. */
public final class CodebookMerge {

    private CodebookMerge() {
    }

    /**
     * @param variables the merged variables: the YAML's first, in their order, then the codebook's others
     * @param report    one printable line per decision
     */
    public record Merged(List<VariableConfig> variables, List<String> report) {
    }

    public static Merged merge(List<VariableConfig> yaml, DatasetCodebook codebook) {
        throw new UnsupportedOperationException("not written yet");
    }
}
