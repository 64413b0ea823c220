package org.wavewarden.pipeline;

import org.jdbi.v3.core.Jdbi;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.judge.Finding;
import org.wavewarden.missing.CaseSelection;
import org.wavewarden.missing.ScreenedWave;
import org.wavewarden.read.CaseSource;
import org.wavewarden.read.WaveSource;
import org.wavewarden.store.CaseLists;

import java.util.ArrayList;
import java.util.List;
import java.util.Optional;

/**
 * The case lists of a judged wave, made after its findings and before the run is written: which findings list
 * cases ({@link CaseSelection}), and for all of them together one read of the wave ({@link CaseSource}). Nothing
 * is read when no finding lists cases, nor when the run is already stored (its lists are too).
 */
final class CaseListing {

    private CaseListing() {
    }

    /** The findings that list cases, each with its place among the run's findings. */
    record Wanted(List<Integer> findingIndex, List<Finding> findings, List<CaseSelection.Selection> selections) {

        boolean isEmpty() {
            return selections.isEmpty();
        }
    }

    /**
     * Which findings list cases. Without a respondent key there are no lists. The run's notes say so once,
     * naming how many findings would have had one, only when the dataset configures breakdowns: there the user
     * asked for the field work to be examined, while a dataset that never did would be told about a feature it
     * did not ask for on every run.
     */
    static Wanted wanted(DatasetConfig d, List<Finding> findings, ScreenedWave screened, List<String> notes) {
        List<Integer> index = new ArrayList<>();
        List<Finding> listed = new ArrayList<>();
        List<CaseSelection.Selection> selections = new ArrayList<>();
        for (int i = 0; i < findings.size(); i++) {
            Optional<CaseSelection.Selection> s = CaseSelection.of(findings.get(i), screened);
            if (s.isPresent() && !s.get().isEmpty()) {
                index.add(i);
                listed.add(findings.get(i));
                selections.add(s.get());
            }
        }
        if (!selections.isEmpty() && d.respondentKey() == null) {
            if (d.breakdowns().isEmpty()) {
                return new Wanted(List.of(), List.of(), List.of());
            }
            notes.add(String.format(java.util.Locale.ROOT, "No case lists: the dataset names no respondentKey, so the"
                    + " %d finding%s whose respondents would be listed for the field team ha%s no list.",
                    selections.size(), selections.size() == 1 ? "" : "s", selections.size() == 1 ? "s" : "ve"));
            return new Wanted(List.of(), List.of(), List.of());
        }
        return new Wanted(index, listed, selections);
    }

    /** The lists, read from the source in one statement; none and no read when nothing is wanted. */
    static List<CaseLists.Draft> read(Jdbi sourceDb, DatasetConfig d, WaveSource source, String wave, Wanted wanted) {
        if (wanted.isEmpty()) {
            return List.of();
        }
        List<CaseSource.Gathered> gathered = sourceDb.withHandle(h -> CaseSource.read(h, source, wave,
                d.respondentKey(), wanted.selections(), d.breakdowns().maxCases()));
        List<CaseLists.Draft> out = new ArrayList<>();
        for (int j = 0; j < gathered.size(); j++) {
            CaseSelection.Selection s = wanted.selections().get(j);
            CaseSource.Gathered g = gathered.get(j);
            out.add(new CaseLists.Draft(wanted.findingIndex().get(j), s.variable(),
                    wanted.findings().get(j).kind().name(), s.description(), g.total(), g.rows(),
                    s.interviewerColumn(), s.interviewer()));
        }
        return out;
    }

    /**
     * The digest's links to the case lists of the reported waves: each wave's current run's lists, whose files lie
     * beside that run's {@code findings.json}, in the wave's folder under the dataset's folder.
     *
     * @param toDatasetFolder the way from the digest's folder to the dataset's folder, holding the waves' folders:
     *                        {@code ""} for a digest in the dataset's folder (the demo's), {@code "../"} for one in a
     *                        folder of its own beside the waves' (the daemon's firing digests and {@code latest})
     */
    static List<org.wavewarden.deliver.CaseLink> links(Session session, String dataset,
                                                        List<org.wavewarden.deliver.FindingsReport> reports,
                                                        String toDatasetFolder) {
        List<org.wavewarden.deliver.CaseLink> out = new ArrayList<>();
        for (org.wavewarden.deliver.FindingsReport r : reports) {
            String folder = toDatasetFolder + org.wavewarden.deliver.OutputPaths.name(r.wave()) + "/";
            session.store().currentRun(dataset, r.wave()).ifPresent(run -> session.store().caseLists()
                    .forRun(run.runId()).forEach(c -> out.add(org.wavewarden.deliver.CaseLink.of(dataset, r.wave(),
                            c).under(folder))));
        }
        return out;
    }
}
