/**
 * Who is asking and what they may do in the console: password hashes checked, a trusted proxy's header, sessions
 * with expiry, CSRF tokens, limits on failed logins. Roles themselves are in {@code review.Role}.
 */
package org.wavewarden.console.auth;
