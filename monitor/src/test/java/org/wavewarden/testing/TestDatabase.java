package org.wavewarden.testing;

import org.wavewarden.db.EmbeddedServer;

import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.SQLException;
import java.util.concurrent.atomic.AtomicInteger;

/**
 * One real embedded PostgreSQL server for the whole test run, and a fresh database per test class, so that
 * integration tests exercise the real driver and server without sharing state.
 */
public final class TestDatabase {

    private static EmbeddedServer server;
    private static final AtomicInteger COUNTER = new AtomicInteger();

    private TestDatabase() {
    }

    public static synchronized EmbeddedServer server() {
        if (server == null) {
            server = EmbeddedServer.start();
            Runtime.getRuntime().addShutdownHook(new Thread(server::close));
        }
        return server;
    }

    /** Creates an empty database and returns its JDBC URL (user postgres, no password: loopback trust). */
    public static String freshDatabase(String prefix) {
        String name = prefix + "_" + COUNTER.incrementAndGet() + "_" + ProcessHandle.current().pid();
        try (Connection c = DriverManager.getConnection(server().jdbcUrl());
             var st = c.createStatement()) {
            st.execute("CREATE DATABASE " + name);
        } catch (SQLException e) {
            throw new IllegalStateException(e);
        }
        return "jdbc:postgresql://localhost:" + server().port() + "/" + name;
    }

    public static Connection connect(String url) throws SQLException {
        return DriverManager.getConnection(url, "postgres", "");
    }
}
