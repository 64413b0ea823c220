package org.wavewarden.daemon;

import org.quartz.utils.ConnectionProvider;

import javax.sql.DataSource;
import java.sql.Connection;
import java.sql.SQLException;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;

/**
 * Hands Quartz's JDBC job store a pool the daemon already opened. Quartz builds connection providers by class
 * name from its properties, so the pool is looked up in a registry by the key the daemon put in the properties.
 */
public final class RegisteredConnectionProvider implements ConnectionProvider {

    private static final Map<String, DataSource> REGISTRY = new ConcurrentHashMap<>();

    private String registryKey;

    static void register(String key, DataSource ds) {
        REGISTRY.put(key, ds);
    }

    static void unregister(String key) {
        REGISTRY.remove(key);
    }

    /** Set by Quartz from {@code org.quartz.dataSource.NAME.registryKey}. */
    public void setRegistryKey(String registryKey) {
        this.registryKey = registryKey;
    }

    @Override
    public Connection getConnection() throws SQLException {
        DataSource ds = REGISTRY.get(registryKey);
        if (ds == null) {
            throw new SQLException("no data source registered as " + registryKey);
        }
        return ds.getConnection();
    }

    @Override
    public void shutdown() {
        // The daemon owns the pool and closes it.
    }

    @Override
    public void initialize() {
        if (registryKey == null) {
            throw new IllegalStateException("registryKey is not set");
        }
    }
}
