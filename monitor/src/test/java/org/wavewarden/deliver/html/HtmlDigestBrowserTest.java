package org.wavewarden.deliver.html;

import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.File;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

/**
 * Opens a rendered digest in a real headless Chromium with networking off: the browser's parsed DOM must hold every
 * alert with its chart, the page must parse to its end, log no script or policy errors, and paint a screenshot.
 */
class HtmlDigestBrowserTest {

    private static final long TIMEOUT_SECONDS = 30;

    @TempDir
    static Path dir;
    static Path page;

    @BeforeAll
    static void writePage() throws IOException {
        page = dir.resolve("digest.html");
        Files.writeString(page, HtmlDigest.render("harrowmere-household",
                List.of(DigestFixtures.quietWave(), DigestFixtures.busyWave()), DigestFixtures.AT),
                StandardCharsets.UTF_8);
    }

    static String chromium() {
        for (String p : System.getenv().getOrDefault("PATH", "").split(File.pathSeparator)) {
            for (String name : List.of("chromium", "chromium-browser")) {
                Path exe = Path.of(p, name);
                if (Files.isExecutable(exe)) {
                    return exe.toString();
                }
            }
        }
        return fail("chromium is not on PATH; this test needs a real browser (Debian: apt-get install chromium)");
    }

    record Run(int exit, String stdout, String stderr) {
    }

    static Run browse(String... extra) throws Exception {
        return browse(page, dir, extra);
    }

    /** Opens {@code page} in headless Chromium with a fresh profile under {@code dir}. */
    static Run browse(Path page, Path dir, String... extra) throws Exception {
        Path profile = Files.createTempDirectory(dir, "profile");
        List<String> cmd = new ArrayList<>(List.of(chromium(), "--headless", "--no-sandbox", "--disable-gpu",
                "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update",
                "--disable-sync", "--disable-extensions", "--user-data-dir=" + profile, "--enable-logging=stderr",
                "--v=0"));
        cmd.addAll(List.of(extra));
        cmd.add(page.toUri().toString());
        Path out = dir.resolve("out-" + profile.getFileName());
        Path err = dir.resolve("err-" + profile.getFileName());
        Process p = new ProcessBuilder(cmd).redirectOutput(out.toFile()).redirectError(err.toFile()).start();
        if (!p.waitFor(TIMEOUT_SECONDS, TimeUnit.SECONDS)) {
            p.destroyForcibly();
            fail("chromium did not finish within " + TIMEOUT_SECONDS + " s");
        }
        return new Run(p.exitValue(), Files.readString(out), Files.readString(err));
    }

    /** Lines in which the page itself complained: script errors, console errors, blocked fetches. */
    static List<String> pageErrors(String stderr) {
        return stderr.lines().filter(l -> l.contains("Uncaught") || l.contains("CONSOLE")
                || l.contains("Content Security Policy") || l.contains("Refused to")
                || l.contains("net::ERR_")).toList();
    }

    @Test
    void theBrowserParsesEveryAlertWithItsChart() throws Exception {
        Run r = browse("--dump-dom");
        assertEquals(0, r.exit(), r.stderr());
        String dom = r.stdout();
        assertTrue(dom.contains("id=\"end-of-digest\""), "the DOM parsed to the end of the page");
        Matcher m = Pattern.compile("<article class=\"alert[^\"]*\" data-variable=\"([^\"]+)\" data-kind=\"([A-Z_]+)\""
                + "(.*?)</article>", Pattern.DOTALL).matcher(dom);
        List<String> seen = new ArrayList<>();
        while (m.find()) {
            seen.add(m.group(1) + "/" + m.group(2));
            assertTrue(m.group(3).contains("<svg class=\"plot "), "svg.plot inside " + m.group(1));
        }
        assertEquals(List.of("interview_mode/SHIFT", "commute_minutes/SHIFT", "height_cm/MISSING_RATE_CHANGE",
                "mooring_fee/SHIFT"), seen);
        assertFalse(dom.contains("<script"), "the hostile category stayed text");
        assertTrue(dom.contains("&lt;script&gt;alert(1)&lt;/script&gt;"));
        assertTrue(pageErrors(r.stderr()).isEmpty(), "page errors: " + pageErrors(r.stderr()));
    }

    @Test
    void theBrowserPaintsTheDigest() throws Exception {
        Path png = dir.resolve("digest.png");
        Run r = browse("--screenshot=" + png, "--window-size=1280,2000", "--hide-scrollbars");
        assertEquals(0, r.exit(), r.stderr());
        assertTrue(Files.exists(png), "no screenshot written: " + r.stderr());
        byte[] bytes = Files.readAllBytes(png);
        assertTrue(bytes.length > 20_000, "a painted page with charts is more than a blank image: " + bytes.length);
        byte[] signature = {(byte) 0x89, 'P', 'N', 'G', '\r', '\n', 0x1a, '\n'};
        assertArrayEquals(signature, java.util.Arrays.copyOf(bytes, 8));
        assertTrue(pageErrors(r.stderr()).isEmpty(), "page errors: " + pageErrors(r.stderr()));
    }
}
