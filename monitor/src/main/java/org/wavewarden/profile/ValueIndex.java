package org.wavewarden.profile;

import java.util.Arrays;

/**
 * Numbers distinct keys 0, 1, 2, ... in the order they first arrive, so the counting tables of the read and profile
 * stages keep their counts, weights and sums in plain arrays indexed by that number, with no object per cell.
 *
 * <p>A key is either one or two {@code long}s (a value's bits; a pair of values; a PSU and a value) or a byte string
 * (a text or {@code numeric} cell), fixed when the index is made. Open addressing with linear probing over a slot
 * table at most half full, which doubles as it fills. A slot holds its entry's number plus one (zero when empty)
 * beside the key's longs (for a byte string: its hash), so a probe compares keys without leaving the slot table;
 * the keys are kept per entry as well, for reading them back. A key new to the index gets the number
 * {@link #size()} had before the call, which is how a caller tells a new key from one seen before; growing never
 * renumbers entries, so the caller's arrays never move.
 */
public final class ValueIndex {

    /** What a key is; an index holds keys of one kind. */
    private enum Kind { LONG, PAIR, BYTES }

    private final Kind kind;
    // Small to start with: a scan with breakdowns holds one index per domain's bins and per column, most of them
    // with a handful of keys, and the tables double as they fill.
    // One array of slots, each {@code stride} longs side by side: the entry's number plus one (0: empty), the key's first
    // long (for bytes: its hash) and, for pairs, its second long. A probe reads one slot's longs from one cache line;
    // with breakdowns a scan holds many tables, mostly out of cache, and separate arrays cost a miss each.
    private final int stride;
    private long[] table;
    private long[] first = new long[8]; // for bytes: the key's offset in the arena
    private long[] second; // for bytes: the key's length; for pairs: the second long; null for single longs (0)
    private byte[] arena; // for bytes: each key once, back to back
    private int used;
    private int size;

    private ValueIndex(Kind kind) {
        this.kind = kind;
        this.stride = kind == Kind.PAIR ? 3 : 2;
        this.table = new long[16 * stride];
        if (kind == Kind.BYTES) {
            arena = new byte[64];
        }
        if (kind != Kind.LONG) {
            second = new long[first.length];
        }
    }

    /** An index keyed by one long; its keys are {@code (key, 0)} to the methods that take two. */
    public static ValueIndex ofLongs() {
        return new ValueIndex(Kind.LONG);
    }

    /** An index keyed by pairs of longs. */
    public static ValueIndex ofPairs() {
        return new ValueIndex(Kind.PAIR);
    }

    /** An index keyed by byte strings. */
    public static ValueIndex ofBytes() {
        return new ValueIndex(Kind.BYTES);
    }

    /** Distinct keys held; the entries are numbered 0 to size() - 1. */
    public int size() {
        return size;
    }

    /** The entry of a key, adding it if it is new. */
    public int add(long key) {
        return add(key, 0, Integer.MAX_VALUE);
    }

    /** The entry of a pair of longs, adding it if it is new. */
    public int add(long a, long b) {
        return add(a, b, Integer.MAX_VALUE);
    }

    /**
     * The entry of a pair of longs (a single key is {@code (key, 0)}); a new key is added only while fewer than
     * {@code limit} are held, else the result is -1.
     */
    public int add(long a, long b, int limit) {
        requireLongs(b);
        int i = probe(a, b, mix(a, b));
        if (table[i] != 0) {
            return (int) table[i] - 1;
        }
        if (size >= limit) {
            return -1;
        }
        int e = claim(i, a, b);
        first[e] = a;
        if (second != null) {
            second[e] = b;
        }
        return e;
    }

    /** The entry of a long key, or -1 when it is not held. */
    public int find(long key) {
        return find(key, 0);
    }

    /** The entry of a pair of longs, or -1 when it is not held. */
    public int find(long a, long b) {
        requireLongs(b);
        return (int) table[probe(a, b, mix(a, b))] - 1;
    }

    /** Slots in the table; a power of two. */
    private int capacity() {
        return table.length / stride;
    }

    /** The start in {@link #table} of the slot holding the key (a, b), or of the empty slot where it would go. */
    private int probe(long a, long b, int h) {
        int mask = capacity() - 1;
        int i = (h & mask) * stride;
        boolean pair = stride == 3;
        while (table[i] != 0 && (table[i + 1] != a || pair && table[i + 2] != b)) {
            i += stride;
            if (i == table.length) {
                i = 0;
            }
        }
        return i;
    }

    /**
     * The entry of the byte string {@code b[p .. p+len)}, copied into the index if it is new; a new key is added only
     * while fewer than {@code limit} are held, else the result is -1.
     */
    public int add(byte[] b, int p, int len, int limit) {
        requireKind(Kind.BYTES);
        int h = hash(b, p, len);
        int mask = capacity() - 1;
        int i = (h & mask) * stride;
        int e;
        while ((e = (int) table[i]) != 0) {
            e--;
            if (table[i + 1] == h && second[e] == len
                    && Arrays.equals(arena, (int) first[e], (int) first[e] + len, b, p, p + len)) {
                return e;
            }
            i += stride;
            if (i == table.length) {
                i = 0;
            }
        }
        if (size >= limit) {
            return -1;
        }
        if (used + len > arena.length) {
            arena = Arrays.copyOf(arena, Math.max(arena.length * 2, used + len));
        }
        System.arraycopy(b, p, arena, used, len);
        e = claim(i, h, 0);
        first[e] = used;
        second[e] = len;
        used += len;
        return e;
    }

    /** The first long of an entry's key (the key itself for an index of single longs). */
    public long first(int entry) {
        requireLongs(0);
        return first[check(entry)];
    }

    /** The second long of an entry's key. */
    public long second(int entry) {
        requireLongs(0);
        int e = check(entry);
        return second == null ? 0 : second[e];
    }

    /** The array an entry's bytes sit in, valid until the next {@code add}; see {@link #offset} and {@link #length}. */
    public byte[] bytes() {
        requireKind(Kind.BYTES);
        return arena;
    }

    public int offset(int entry) {
        requireKind(Kind.BYTES);
        return (int) first[check(entry)];
    }

    public int length(int entry) {
        requireKind(Kind.BYTES);
        return (int) second[check(entry)];
    }

    /**
     * The length a caller's per-entry array needs to hold {@code entry}: unchanged while it fits, else doubled, so
     * a caller grows its arrays with {@code Arrays.copyOf(a, ValueIndex.capacityFor(entry, a.length))}.
     */
    public static int capacityFor(int entry, int length) {
        return entry < length ? length : Math.max(entry + 1, length * 2);
    }

    private int claim(int slot, long a, long b) {
        int e = size;
        if (e == first.length) {
            first = Arrays.copyOf(first, e * 2);
            if (second != null) {
                second = Arrays.copyOf(second, e * 2);
            }
        }
        table[slot] = ++size;
        table[slot + 1] = a;
        if (stride == 3) {
            table[slot + 2] = b;
        }
        if (size * 2 > capacity()) {
            rehash();
        }
        return e;
    }

    private void rehash() {
        long[] old = table;
        table = new long[old.length * 2];
        int mask = capacity() - 1;
        for (int j = 0; j < old.length; j += stride) {
            if (old[j] == 0) {
                continue;
            }
            long b = stride == 3 ? old[j + 2] : 0;
            int h = kind == Kind.BYTES ? (int) old[j + 1] : mix(old[j + 1], b);
            int i = (h & mask) * stride;
            while (table[i] != 0) {
                i += stride;
                if (i == table.length) {
                    i = 0;
                }
            }
            System.arraycopy(old, j, table, i, stride);
        }
    }

    private int check(int entry) {
        if (entry < 0 || entry >= size) {
            throw new IndexOutOfBoundsException("entry " + entry + " of " + size);
        }
        return entry;
    }

    /** Longs are asked of an index of longs or pairs; a second long other than 0 of an index of pairs only. */
    private void requireLongs(long second) {
        if (kind == Kind.BYTES || kind == Kind.LONG && second != 0) {
            throw new IllegalStateException("this index is keyed by " + kind + ", not by pairs of longs");
        }
    }

    private void requireKind(Kind k) {
        if (kind != k) {
            throw new IllegalStateException("this index is keyed by " + kind + ", not " + k);
        }
    }

    /**
     * The slot hash of a pair of longs: the pair folded into one long and put through the 64-bit finaliser of
     * SplitMix64 (Steele, Lea and Flood 2014, "Fast splittable pseudorandom number generators", OOPSLA), in which
     * every input bit reaches every output bit. Keys that differ only in their high bits (the bits of small whole
     * doubles, whose low mantissa bits are all zero) spread over the table as well as keys that differ in their
     * low bits (consecutive integers, neighbouring bins); a plain multiply leaves the former clustered in the low
     * bits that pick a slot, and probe chains grow long.
     */
    static int mix(long a, long b) {
        long z = a ^ Long.rotateLeft(b * 0xC2B2AE3D27D4EB4FL, 31);
        z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
        return (int) (z ^ (z >>> 31));
    }

    /** FNV-1a over the bytes and their length, its high half folded in so the low bits that pick a slot vary. */
    private static int hash(byte[] b, int p, int len) {
        int h = 0x811C9DC5 ^ len;
        for (int j = p; j < p + len; j++) {
            h = (h ^ b[j]) * 0x01000193;
        }
        return h ^ (h >>> 16);
    }
}
