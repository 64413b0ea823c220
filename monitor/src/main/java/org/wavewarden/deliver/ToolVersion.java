package org.wavewarden.deliver;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.util.Properties;

/** The version of Wavewarden that is running, as the build wrote it from the Maven project version. */
public final class ToolVersion {

    /** What a build without the version resource (classes compiled outside Maven) reports. */
    public static final String UNKNOWN = "development build";

    private static final String VERSION = read();

    private ToolVersion() {
    }

    public static String current() {
        return VERSION;
    }

    private static String read() {
        try (InputStream in = ToolVersion.class.getResourceAsStream("/org/wavewarden/version.properties")) {
            if (in == null) {
                return UNKNOWN;
            }
            Properties p = new Properties();
            p.load(in);
            String v = p.getProperty("version", "").trim();
            // An unfiltered resource still holds the placeholder.
            return v.isEmpty() || v.contains("${") ? UNKNOWN : v;
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read the version resource", e);
        }
    }
}
