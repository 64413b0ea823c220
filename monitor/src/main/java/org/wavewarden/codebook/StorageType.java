package org.wavewarden.codebook;

/** How a variable's values are stored in the source file: numbers, text, calendar dates, or date-times. */
public enum StorageType {
    NUMBER, TEXT, DATE, DATETIME
}
