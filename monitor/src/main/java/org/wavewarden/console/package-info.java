/**
 * The web console around the pipeline: its routes on the daemon's HTTP server ({@code ConsoleApp}), who may do what
 * ({@code auth}: logins, sessions, CSRF tokens, login limits) and the pages ({@code page}: HTML from records). It
 * computes nothing: numbers come from the results schema ({@code store.ConsoleReads}) and actions go through the
 * lifecycle code the commands use.
 */
package org.wavewarden.console;
