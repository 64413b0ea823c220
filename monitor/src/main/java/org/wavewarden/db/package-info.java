/**
 * Database connections: the pools ({@code Databases}, the source read-only at the server), a connection's password
 * resolved without ever being logged ({@code Secrets}), and the embedded PostgreSQL server of the demo and tests
 * ({@code EmbeddedServer}, loopback only).
 */
package org.wavewarden.db;
