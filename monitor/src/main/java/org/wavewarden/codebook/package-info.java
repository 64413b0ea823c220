/**
 * What a codebook says about each variable, wherever it comes from: an SPSS file's dictionary, a DDI-Codebook XML
 * file, a CSV codebook of our own format. Names, variable labels, value labels, declared missing values and ranges,
 * measurement level, units and valid ranges ({@link org.wavewarden.codebook.VariableMeta}); the readers of each
 * source; the merge with the YAML configuration (the YAML wins, and the merge is printed). No data is read here.
 */
package org.wavewarden.codebook;
