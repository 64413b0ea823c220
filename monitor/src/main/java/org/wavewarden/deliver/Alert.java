package org.wavewarden.deliver;

import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;

import java.util.List;
import java.util.Objects;

/**
 * One event a person is told about: every finding worth a person's time about one variable of one judged wave
 * (a paired and a distribution shift of it, the missing-rate change a sentinel causes, the sentinel itself), so
 * that the event is one alert however many ways it was seen. A relationship between two variables and a finding on
 * the whole wave are events of their own.
 *
 * @param facets the event's findings, the most urgent first ({@link FindingsFiles#ordered}); never empty
 */
public record Alert(List<Finding> facets) {

    public Alert {
        Objects.requireNonNull(facets, "facets");
        if (facets.isEmpty()) {
            throw new IllegalArgumentException("facets: expected at least one finding but got none");
        }
        facets = List.copyOf(facets);
    }

    /** A single finding as its own alert. */
    public static Alert of(Finding finding) {
        return new Alert(List.of(finding));
    }

    /** The most urgent finding, which names the alert and whose plot the digest draws. */
    public Finding lead() {
        return facets.get(0);
    }

    public String variable() {
        return lead().variable();
    }

    public FindingKind kind() {
        return lead().kind();
    }

    /** The baseline the event was judged against when the run judged several (null: the run's main one). */
    public String against() {
        return lead().against();
    }

    /** The lead's verdict; null when it is a data-quality finding without one. */
    public Verdict verdict() {
        return lead().verdict();
    }

    /** The kinds of the findings after the lead, in order. */
    public List<FindingKind> otherKinds() {
        return facets.subList(1, facets.size()).stream().map(Finding::kind).toList();
    }

    /**
     * What aspect of an event a finding shows, as a reader names it: the answers of the same respondents
     * ({@link #PAIRED}), the waves' distributions, weighted where the dataset is ({@link #DISTRIBUTION}), their
     * shape, the wave against a reference, the share missing, the data's quality, the table's columns, a pair of
     * variables, or the wave as a whole.
     */
    public enum Facet {
        PAIRED, DISTRIBUTION, SHAPE, REFERENCE, MISSING_RATE, DATA_QUALITY, SCHEMA, RELATIONSHIP, WAVE, NOT_COMPARED;

        public static Facet of(FindingKind kind) {
            return switch (kind) {
                case PANEL_SHIFT -> PAIRED;
                case SHIFT -> DISTRIBUTION;
                case SHAPE_CHANGE -> SHAPE;
                case REFERENCE -> REFERENCE;
                case MISSING_RATE_CHANGE -> MISSING_RATE;
                case COLUMN_ADDED, COLUMN_DROPPED, COLUMN_RETYPED -> SCHEMA;
                case RELATIONSHIP_CHANGE -> RELATIONSHIP;
                case EMPTY_WAVE, SIGNED_WAVE_CHANGED -> WAVE;
                case SKIPPED -> NOT_COMPARED;
                default -> DATA_QUALITY;
            };
        }
    }
}
