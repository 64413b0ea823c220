package org.wavewarden.config;

/**
 * Where a dataset's codebook is: {@code codebook: {ddi: path}} or {@code codebook: {csv: path}}.
 *
 * @param format the key it was given under: {@code ddi} or {@code csv}
 * @param path   as written in the config: relative to the config file's folder, or absolute
 * @param sha256 the file's content digest once read (null before): part of the config fingerprint, so that a changed
 *               codebook counts as a changed configuration
 */
public record CodebookSource(String format, String path, String sha256) {

    /** The key path of the path in the config, e.g. {@code datasets[2].codebook.ddi}. */
    public String key(int datasetIndex) {
        return "datasets[" + datasetIndex + "].codebook." + format;
    }

    public CodebookSource read(String digest) {
        return new CodebookSource(format, path, digest);
    }
}
