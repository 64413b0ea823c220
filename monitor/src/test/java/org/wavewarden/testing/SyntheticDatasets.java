package org.wavewarden.testing;

import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;

/** A config whose datasets are synthetic-survey tables in schema {@code gen}, one dataset per table. */
public final class SyntheticDatasets {

    private SyntheticDatasets() {
    }

    /** Each table is a dataset of the same name, waves in column {@code wave}, the respondent id excluded. */
    public static WardenConfig config(String url, String resultsSchema, String... tables) {
        StringBuilder yaml = new StringBuilder("source:\n  jdbcUrl: \"" + url + "\"\n  user: postgres\n"
                + "results:\n  schema: " + resultsSchema + "\ndatasets:\n");
        for (String t : tables) {
            yaml.append("  - name: ").append(t).append("\n    table: gen.").append(t)
                    .append("\n    waveColumn: wave\n    exclude: [respondent_id]\n");
        }
        return ConfigLoader.parse(yaml.toString());
    }
}
