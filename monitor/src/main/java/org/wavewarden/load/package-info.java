/** Importing a wave from a CSV file into a source table, in one transaction ({@code CsvWaveImporter}). */
package org.wavewarden.load;
