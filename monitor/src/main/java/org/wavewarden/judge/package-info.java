/**
 * The judging stage: a run's comparisons as one false-discovery-rate family, the verdict rule on each q-value and
 * effect interval, the sentence, and the rules that decide which findings a reader gets
 * ({@link org.wavewarden.judge.WaveVerdicts}).
 */
package org.wavewarden.judge;
