package org.wavewarden.deliver;

import org.wavewarden.config.Population;

import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * What the digests show beyond the findings, read from the results schema and the configuration by the caller so
 * that rendering stays a function of records: each dataset's population (a complete enumeration is judged without
 * tests, and the digest says so once) and each judged wave's review status.
 *
 * @param populations each dataset's population; a dataset not named is a sample
 * @param waves       the review status of the judged waves; a wave not listed shows no status line
 * @param caseLinks   the case lists of the judged waves' findings, linked where the files lie beside the digest
 */
public record DigestRecords(Map<String, Population> populations, List<WaveStatus> waves, List<CaseLink> caseLinks) {

    /** Nothing known beyond the findings: a digest written straight after a run, before anyone reviewed it. */
    public static final DigestRecords NONE = new DigestRecords(Map.of(), List.of());

    public DigestRecords {
        populations = populations == null ? Map.of() : Map.copyOf(populations);
        waves = waves == null ? List.of() : List.copyOf(waves);
        caseLinks = caseLinks == null ? List.of() : List.copyOf(caseLinks);
    }

    /** Records without case lists. */
    public DigestRecords(Map<String, Population> populations, List<WaveStatus> waves) {
        this(populations, waves, null);
    }

    /** The same records with the case lists linked. */
    public DigestRecords withCaseLinks(List<CaseLink> links) {
        return new DigestRecords(populations, waves, links);
    }

    /** The case lists of one judged wave, in finding order. */
    public List<CaseLink> caseLinks(String dataset, String wave) {
        return caseLinks.stream().filter(c -> c.dataset().equals(dataset) && c.wave().equals(wave)).toList();
    }

    public Optional<WaveStatus> status(String dataset, String wave) {
        return waves.stream().filter(w -> w.dataset().equals(dataset) && w.wave().equals(wave)).findFirst();
    }

    public Population population(String dataset) {
        return populations.getOrDefault(dataset, Population.SAMPLE);
    }

    /** Every unit of the dataset's population observed: a census or a full register. */
    public boolean complete(String dataset) {
        return population(dataset).complete();
    }
}
