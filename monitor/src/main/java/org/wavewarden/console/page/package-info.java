/**
 * The console's pages as HTML text: pure functions of records, every piece of data escaped, styles from one served
 * style sheet, no script required, usable with the keyboard alone.
 */
package org.wavewarden.console.page;
