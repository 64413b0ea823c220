package org.wavewarden.console.page;

import org.wavewarden.review.Role;

/**
 * What every page shows around its content: who is logged in (with the logout form), the search box, and a notice
 * after an action. The CSRF token goes into every form the page holds.
 *
 * @param user      the person's name, or null on the login page
 * @param role      their role, or null on the login page
 * @param csrfToken the token for the page's forms
 * @param notice    a one-line message after an action ("Alert 12 explained."), or null
 */
public record Chrome(String user, Role role, String csrfToken, String notice) {
}
