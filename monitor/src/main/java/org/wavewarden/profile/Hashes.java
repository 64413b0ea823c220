package org.wavewarden.profile;

/**
 * The slot hash of the open-addressing tables the read stage counts in (values by their bits, bins by index, pairs
 * and PSU cells by two keys): a multiply by the golden-ratio constant and xor-shifts, so keys that differ in low
 * bits (consecutive integers, neighbouring bins) spread over the table.
 */
public final class Hashes {

    private Hashes() {
    }

    public static int mix(long key) {
        long h = key * 0x9E3779B97F4A7C15L;
        return (int) (h ^ (h >>> 29) ^ (h >>> 47));
    }

    public static int mix(long a, long b) {
        return mix(a ^ Long.rotateLeft(b * 0xC2B2AE3D27D4EB4FL, 31));
    }
}
