package org.wavewarden.soak;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.TestDatabase;

import java.nio.channels.FileChannel;
import java.nio.channels.FileLock;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.sql.Connection;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The soak refuses what it cannot do before it starts anything, naming the flag (exit 2). */
class SoakCommandTest {

    @TempDir
    Path dir;

    @Test
    void aSoakOfNoMinutesIsRefusedNamingTheFlag() {
        CliRun r = CliRun.of("soak", "--minutes", "0", "--out", dir.toString());
        assertEquals(2, r.exitCode());
        assertTrue(r.err().contains("--minutes"), r.err());
    }

    @Test
    void aServerWithoutALoginRoleIsRefusedNamingTheFlag() {
        CliRun r = CliRun.of("soak", "--minutes", "1", "--jdbc-url", "jdbc:postgresql://127.0.0.1:5432/x",
                "--out", dir.toString());
        assertEquals(2, r.exitCode());
        assertTrue(r.err().contains("--user"), r.err());
    }

    @Test
    void aJdbcUrlTheDaemonsConfigWouldRefuseIsRefusedNamingTheFlagBeforeAnythingStarts() {
        for (String url : new String[] {
                "jdbc:postgresql://127.0.0.1:1/x?options=-c%20default_transaction_read_only=off",
                "jdbc:postgresql://127.0.0.1:1/x?password=hunter2"}) {
            CliRun r = CliRun.of("soak", "--minutes", "1", "--jdbc-url", url, "--user", "postgres",
                    "--out", dir.toString());
            assertEquals(2, r.exitCode(), r.err());
            assertTrue(r.err().contains("--jdbc-url"), r.err());
            assertFalse(r.out().contains("hunter2") || r.err().contains("hunter2"), r.err());
        }
    }

    @Test
    void aSecondSoakInTheSameFolderIsRefusedNamingTheFlag() throws Exception {
        try (FileChannel c = FileChannel.open(dir.resolve(Soak.LOCK_FILE), StandardOpenOption.CREATE,
                StandardOpenOption.WRITE); FileLock held = c.lock()) {
            CliRun r = CliRun.of("soak", "--minutes", "1", "--out", dir.toString());
            assertEquals(2, r.exitCode());
            assertTrue(r.err().contains("--out") && r.err().contains("another soak"), r.err());
        }
    }

    @Test
    void anExistingSchemaIsRefusedAndLeftAsItWasWithoutReplace() throws Exception {
        String url = TestDatabase.freshDatabase("soak_refuse");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("CREATE SCHEMA kept_source");
            st.execute("CREATE TABLE kept_source.answers (x integer)");
        }
        CliRun r = CliRun.of("soak", "--minutes", "1", "--jdbc-url", url, "--user", "postgres",
                "--source-schema", "kept_source", "--out", dir.toString());
        assertEquals(2, r.exitCode());
        assertTrue(r.err().contains("--source-schema") && r.err().contains("--replace"), r.err());
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement();
             var rs = st.executeQuery("SELECT to_regclass('kept_source.answers') IS NOT NULL")) {
            rs.next();
            assertTrue(rs.getBoolean(1), "the existing table must survive a refused soak");
        }
    }
}
