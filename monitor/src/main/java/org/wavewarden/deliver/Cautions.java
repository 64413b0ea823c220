package org.wavewarden.deliver;

import java.util.List;

/** The cautions every digest carries, in the words the reader sees. */
public final class Cautions {

    private Cautions() {
    }

    public static final List<String> LINES = List.of(
            "These flags are screening aids, not findings. A flag says where to look; it does not say that the data"
                    + " are wrong or that the population changed.",
            "Publication decisions rest with the survey's own methodologists, who know the design, the fieldwork"
                    + " and the context that no automatic screen sees.",
            "p- and q-values treat each wave as a simple random sample unless weights and design columns are"
                    + " configured; with a complex design they can overstate significance.",
            "MATERIAL and MINOR depend on the thresholds in the configuration; a STABLE verdict means the change is"
                    + " shown to be smaller than that threshold, not that nothing changed.");
}
