package org.wavewarden.deliver;

import org.wavewarden.compare.release.ReleaseRevision;

import java.time.Instant;
import java.util.List;

/**
 * The content of {@code releases.json}: one wave's two publications compared.
 *
 * @param layout         where the earlier publication was found: {@code release column} or {@code previous table}
 * @param before         the earlier publication ("release 1", "previous table survey.wave_v1")
 * @param after          the later publication ("release 2", "table survey.wave")
 * @param columnsAdded   columns only the later publication has (not compared)
 * @param columnsDropped columns only the earlier publication has (not compared)
 * @param cautions       the cautions every digest carries
 */
public record ReleaseReport(String dataset, String wave, String layout, String before, String after,
                            String respondentKey, Instant generatedAt, double alpha, String fdrMethod,
                            List<String> columnsAdded, List<String> columnsDropped, ReleaseRevision revision,
                            List<String> cautions) {

    public ReleaseReport {
        columnsAdded = List.copyOf(columnsAdded);
        columnsDropped = List.copyOf(columnsDropped);
        cautions = List.copyOf(cautions);
    }
}
