/**
 * Two publications of one wave compared cell by cell from rows matched by respondent key: respondents added and
 * removed, changed cells per column, and each release's tallies for judging their distributions as two waves'.
 */
package org.wavewarden.compare.release;
