/**
 * The {@code bench} command: what a check costs against the floor of reading the judged wave, on a synthetic survey
 * generated inside PostgreSQL, with the statements sent to the source counted and the heap watched.
 */
package org.wavewarden.bench;
