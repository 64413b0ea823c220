/**
 * What people concluded about alerts and waves, as rules: the states an alert can be in, the actions and reason
 * categories of its history, which alerts the configuration explains or mutes when they are created, when a wave
 * may be signed off, and when a rerun changed a signed-off wave. The records are kept by {@code store}; nothing
 * here reads or writes the database.
 */
package org.wavewarden.review;
