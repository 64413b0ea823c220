/**
 * The read stage: what a dataset's waves are and where they sit in the source ({@code SourceCatalog},
 * {@code WaveListing}, {@code WaveSource}, {@code ReleaseListing}), and one pass over a wave's rows that tallies every
 * column ({@link org.wavewarden.read.BinaryWaveScanner}: a binary {@code COPY} decoded by {@code CopyBinaryStream}
 * and {@code Decode}, values tallied under their {@code ValueText} in {@code ValueTally}, PSU sums in
 * {@code DesignScan}, domain tallies in {@code DomainScan}, fed a chunk of rows at a time in order of domain by
 * {@code DomainRows}). {@link org.wavewarden.read.KeyedPairReader} matches two selections by respondent key in one
 * {@code COPY}. Reading only: no screening or statistics here.
 */
package org.wavewarden.read;
