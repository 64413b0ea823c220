/**
 * Importing a wave into a source table, in one transaction: CSV files ({@code CsvWaveImporter}) and files that carry
 * their own codebook ({@link org.wavewarden.load.CaseSource}, such as SPSS system files); creating the table when it
 * does not exist yet.
 */
package org.wavewarden.load;
