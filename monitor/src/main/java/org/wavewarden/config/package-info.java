/**
 * The YAML configuration as records, its validating loader (every bad value a
 * {@link org.wavewarden.config.ConfigException} naming its key path), identifier checks and quoting
 * ({@code Identifiers}), the connection URL's allowed parameters ({@code JdbcUrl}) and the fingerprint of the
 * configuration that decides findings ({@code ConfigFingerprint}).
 */
package org.wavewarden.config;
