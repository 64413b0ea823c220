/**
 * The command line ({@link org.wavewarden.cli.Main}): one class per command, shared options, and the checks a
 * command makes before it opens a connection ({@code Preflight}). Commands parse and hand over; rules live in the
 * stages.
 */
package org.wavewarden.cli;
