package org.wavewarden.daemon;

import ch.qos.logback.classic.Level;
import ch.qos.logback.classic.Logger;
import ch.qos.logback.classic.spi.ILoggingEvent;
import ch.qos.logback.core.read.ListAppender;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.slf4j.LoggerFactory;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.pipeline.Session;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.AtomicInteger;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.wavewarden.daemon.DaemonIntegrationTest.FAST;
import static org.wavewarden.daemon.DaemonIntegrationTest.await;
import static org.wavewarden.daemon.DaemonIntegrationTest.count;

/**
 * The job store outlives the config: a dataset removed from the config loses its job and trigger when the daemon
 * starts, and never fires again; a firing that still arrives for it (another instance on an older config) is
 * skipped with one line, not a stack trace.
 */
class JobStoreReconciliationTest {

    static final String RETIRED = "retired-survey";

    @TempDir
    Path dir;
    String url;
    final ListAppender<ILoggingEvent> log = new ListAppender<>();
    final Logger root = (Logger) LoggerFactory.getLogger(org.slf4j.Logger.ROOT_LOGGER_NAME);
    final Logger daemonLog = (Logger) LoggerFactory.getLogger("org.wavewarden.daemon");
    Level daemonLevel;

    @BeforeEach
    void setUp() throws Exception {
        url = TestDatabase.freshDatabase("job_store");
        SmallSurvey.createTable(url);
        Path[] csv = SmallSurvey.writeWaves(dir);
        Files.writeString(dir.resolve("c.yaml"), withRetired());
        CliRun imported = CliRun.of("import", "--config", dir.resolve("c.yaml").toString(), "--dataset", "small-survey", "--wave", "w1",
                csv[0].toString());
        assertEquals(0, imported.exitCode(), imported.err());
        log.start();
        root.addAppender(log);
        daemonLevel = daemonLog.getLevel();
        daemonLog.setLevel(Level.INFO);
    }

    @AfterEach
    void tearDown() {
        root.detachAppender(log);
        daemonLog.setLevel(daemonLevel);
    }

    String withoutRetired() {
        return SmallSurvey.config(url, null).replace("    exclude: [respondent_id]",
                "    exclude: [respondent_id]\n    schedule: \"0/1 * * * * ?\"")
                + "daemon:\n  httpPort: -1\n  outputDir: \"" + dir.resolve("digests").toString().replace("\\", "/")
                + "\"\n";
    }

    String withRetired() {
        return withoutRetired().replace("daemon:\n", "  - name: " + RETIRED + "\n    table: src.answers\n"
                + "    waveColumn: wave\n    exclude: [respondent_id]\n    schedule: \"0/1 * * * * ?\"\n"
                + "    variables:\n      - {name: score, kind: continuous}\ndaemon:\n");
    }

    /** Counts each dataset's firings as they start. */
    static final class Firings implements Daemon.FiringListener {
        final Map<String, AtomicInteger> started = new ConcurrentHashMap<>();

        @Override
        public void started(String dataset) {
            started.computeIfAbsent(dataset, k -> new AtomicInteger()).incrementAndGet();
        }

        int of(String dataset) {
            AtomicInteger n = started.get(dataset);
            return n == null ? 0 : n.get();
        }
    }

    /** The dataset's job and its triggers (the schedule and the redelivery), in the job store. */
    long jobRows(String dataset) {
        return count(url, "SELECT count(*) FROM ww_results.qrtz_job_details WHERE job_name = '" + dataset + "'")
                + count(url, "SELECT count(*) FROM ww_results.qrtz_triggers WHERE trigger_name = '" + dataset + "'");
    }

    Daemon started(WardenConfig cfg, Session s, String instance, Firings firings) throws Exception {
        Daemon d = new Daemon(s, Clock.systemUTC(), FAST, Map.of());
        d.firingListener(firings);
        d.start(instance, 1000);
        return d;
    }

    @Test
    void aDatasetRemovedFromTheConfigLosesItsJobAtTheNextStartAndNeverFiresAgain() throws Exception {
        WardenConfig before = ConfigLoader.parse(withRetired());
        Firings first = new Firings();
        try (Session s = Session.open(before, null, Map.of()); Daemon d = started(before, s, "first", first)) {
            await(() -> first.of(RETIRED) >= 1 && first.of("small-survey") >= 1, "both datasets fired");
        }
        assertEquals(3, jobRows(RETIRED), "the job store keeps the job and its two triggers (schedule, redelivery)"
                + " after the daemon stops");
        log.list.clear(); // the first daemon's own firing lines name it too; what counts is what comes after

        WardenConfig after = ConfigLoader.parse(withoutRetired());
        Firings second = new Firings();
        try (Session s = Session.open(after, null, Map.of()); Daemon d = started(after, s, "second", second)) {
            assertEquals(0, jobRows(RETIRED), "job and trigger of the removed dataset are deleted at start");
            await(() -> second.of("small-survey") >= 3, "the configured dataset keeps firing");
            assertEquals(0, second.of(RETIRED), "the removed dataset never fires");
        }
        List<ILoggingEvent> named = events(RETIRED);
        assertEquals(1, named.size(), "one line names the removed dataset: " + named);
        assertEquals(Level.WARN, named.get(0).getLevel());
        assertTrue(named.get(0).getFormattedMessage().contains("no longer in the config"),
                named.get(0).getFormattedMessage());
    }

    @Test
    void aChangedScheduleReplacesTheStoredOneAndIsLogged() throws Exception {
        WardenConfig before = ConfigLoader.parse(withoutRetired().replace("0/1 * * * * ?", "0 15 2 * * ?"));
        try (Session s = Session.open(before, null, Map.of()); Daemon d = started(before, s, "first", new Firings())) {
            assertEquals("0 15 2 * * ?", storedCron("small-survey"));
        }
        WardenConfig after = ConfigLoader.parse(withoutRetired());
        Firings firings = new Firings();
        try (Session s = Session.open(after, null, Map.of()); Daemon d = started(after, s, "second", firings)) {
            assertEquals("0/1 * * * * ?", storedCron("small-survey"));
            await(() -> firings.of("small-survey") >= 1, "the new schedule fires");
        }
        assertTrue(events("small-survey").stream().anyMatch(e -> e.getFormattedMessage().contains(
                "changed from '0 15 2 * * ?' to '0/1 * * * * ?'")), "the change is logged");
    }

    @Test
    void aFiringForADatasetThisDaemonDoesNotKnowIsSkippedWithOneLineAndNoStackTrace() throws Exception {
        WardenConfig current = ConfigLoader.parse(withoutRetired());
        WardenConfig older = ConfigLoader.parse(withRetired());
        Firings firings = new Firings();
        try (Session s = Session.open(current, null, Map.of()); Daemon d = started(current, s, "current", firings)) {
            // Another instance on the older config starts, re-adds the retired dataset's job, and stops.
            try (Session o = Session.open(older, null, Map.of());
                 Daemon old = started(older, o, "older", new Firings())) {
                // The current instance shares the job store and fires every second: it may already have taken one
                // of the re-added triggers (and with it the skip below) before this look, so the job is there, or
                // its skip has been logged; exactly one skip line is required at the end either way.
                long rows = jobRows(RETIRED);
                assertTrue(rows == 3 || events(RETIRED).stream()
                                .anyMatch(e -> e.getFormattedMessage().contains("was skipped")),
                        "job, schedule and redelivery triggers, or the current instance's skip of them: " + rows);
            }
            await(() -> jobRows(RETIRED) == 0, "the current instance drops the unknown dataset's job when it fires");
            assertEquals(0, firings.of(RETIRED), "the current instance never judges it");
        }
        List<ILoggingEvent> skipped = events(RETIRED).stream()
                .filter(e -> e.getFormattedMessage().contains("was skipped")).toList();
        assertEquals(1, skipped.size(), "one line: " + skipped);
        assertEquals(Level.WARN, skipped.get(0).getLevel());
        assertEquals(null, skipped.get(0).getThrowableProxy(), "no stack trace");
        assertTrue(log.list.stream().noneMatch(e -> e.getLevel() == Level.ERROR), "no ERROR: " + log.list.stream()
                .filter(e -> e.getLevel() == Level.ERROR).map(ILoggingEvent::getFormattedMessage).toList());
    }

    String storedCron(String dataset) {
        try (var c = TestDatabase.connect(url); var st = c.createStatement();
             var rs = st.executeQuery("SELECT cron_expression FROM ww_results.qrtz_cron_triggers WHERE trigger_name = '"
                     + dataset + "'")) {
            return rs.next() ? rs.getString(1) : null;
        } catch (Exception e) {
            throw new AssertionError(e);
        }
    }

    /** Log events that name the dataset, in the message or in an attached exception. */
    List<ILoggingEvent> events(String dataset) {
        return List.copyOf(log.list).stream().filter(e -> e.getFormattedMessage().contains(dataset)
                || (e.getThrowableProxy() != null && String.valueOf(e.getThrowableProxy().getMessage())
                .contains(dataset))).toList();
    }

}
