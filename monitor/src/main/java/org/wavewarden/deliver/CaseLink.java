package org.wavewarden.deliver;

import org.wavewarden.store.CaseLists;

/**
 * A digest's link to one finding's case list: the file beside {@code findings.json} (a relative path made of safe
 * characters only) and what it holds, e.g. "first 5,000 of 12,345 cases".
 *
 * @param dataset  the dataset
 * @param wave     the judged wave
 * @param variable the variable listed
 * @param kind     the finding's kind
 * @param file     the file, relative to the folder of {@code findings.json}
 * @param count    the cases it holds, in words
 */
public record CaseLink(String dataset, String wave, String variable, String kind, String file, String count) {

    public static CaseLink of(String dataset, String wave, CaseLists.CaseList list) {
        return new CaseLink(dataset, wave, list.variable(), list.kind() + (list.interviewer() == null ? ""
                : " " + list.interviewerColumn() + " " + list.interviewer()), list.fileName(), list.count());
    }

    /** The same link from a digest elsewhere: {@code folder} (safe characters, ending in "/") leads to the file's. */
    public CaseLink under(String folder) {
        return new CaseLink(dataset, wave, variable, kind, folder + file, count);
    }

    /** "height_cm NUMERIC_SENTINEL": the finding the list belongs to, in words. */
    public String subject() {
        return variable + " " + kind;
    }
}
