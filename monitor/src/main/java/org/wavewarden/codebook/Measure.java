package org.wavewarden.codebook;

/** The measurement level a codebook declares (SPSS measure, DDI {@code nature}); UNKNOWN when it says nothing. */
public enum Measure {
    NOMINAL, ORDINAL, SCALE, UNKNOWN
}
