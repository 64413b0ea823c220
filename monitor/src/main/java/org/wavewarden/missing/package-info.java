/**
 * The missing-values stage: a wave's variables (declared, or inferred from an undeclared column's tally by
 * {@link org.wavewarden.missing.VariableInference}), and each wave screened once per run
 * ({@link org.wavewarden.missing.ScreenedWave}) into every variable's valid answers and missing reasons, by codebook
 * codes, the disguised-missing detector, the declared range and the one rule for a valid numeric answer
 * ({@link org.wavewarden.missing.ValidNumber}); and the data-quality findings of a screened variable (missing codes
 * and rates, text in numbers, code frames, heaping, digit preference). Later stages read answers from a screened
 * wave and never screen again.
 */
package org.wavewarden.missing;
