/**
 * The SPSS system file format (.sav, bytecode-compressed .sav and zlib-compressed .zsav): its dictionary (variable
 * and value labels, user-missing values and ranges, measurement levels, long names and long strings, the character
 * encoding) and its cases, read as a {@link org.wavewarden.load.CaseSource}; and a writer of the same format.
 */
package org.wavewarden.load.spss;
