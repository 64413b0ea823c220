/**
 * The comparison stage: which comparison a screened variable gets ({@link org.wavewarden.compare.VariableComparisons}:
 * by kind, weighted or design-based where the dataset has weights, against its reference, or the reason it is
 * skipped), and the methods themselves, one sub-package per family. Comparisons are pure functions of screened
 * answers; judging them is the {@code judge} package's.
 */
package org.wavewarden.compare;
