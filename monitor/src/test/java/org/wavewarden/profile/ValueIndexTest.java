package org.wavewarden.profile;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

import java.nio.charset.StandardCharsets;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

/**
 * The index is held to {@link java.util.HashMap} on seeded random insert sequences: every key gets the number it
 * first arrived as, through growth and through keys chosen to collide in the slot table.
 */
class ValueIndexTest {

    /** Key streams: few distinct keys, many (growth past several doublings), and keys that share their slot. */
    private static long key(Random r, int stream) {
        return switch (stream) {
            case 0 -> r.nextInt(20);
            case 1 -> r.nextInt(50_000) - 25_000;
            case 2 -> r.nextLong();
            default -> collidingKeys(r.nextInt(300));
        };
    }

    /** The i-th of a set of keys whose hashes agree in their low 10 bits: they probe one run of the slot table. */
    private static final List<Long> COLLIDING = new java.util.ArrayList<>();

    private static long collidingKeys(int i) {
        synchronized (COLLIDING) {
            long k = COLLIDING.isEmpty() ? 0 : COLLIDING.get(COLLIDING.size() - 1) + 1;
            while (COLLIDING.size() <= i) {
                if ((ValueIndex.mix(k, 0) & 1023) == 7) {
                    COLLIDING.add(k);
                }
                k++;
            }
            return COLLIDING.get(i);
        }
    }

    @ParameterizedTest(name = "key stream {0}")
    @ValueSource(ints = {0, 1, 2, 3})
    void singleLongKeysAreNumberedAsAHashMapOfFirstArrivalsNumbersThem(int stream) {
        Random r = new Random(17 + stream);
        ValueIndex index = ValueIndex.ofLongs();
        Map<Long, Integer> reference = new HashMap<>();
        for (int i = 0; i < 60_000; i++) {
            long k = key(r, stream);
            int expected = reference.computeIfAbsent(k, x -> reference.size());
            if (r.nextInt(4) == 0) {
                assertEquals(reference.containsKey(k) && expected < index.size() ? expected : -1, index.find(k));
            }
            assertEquals(expected, index.add(k), "key " + k);
            assertEquals(reference.size(), index.size());
        }
        reference.forEach((k, e) -> {
            assertEquals(e, index.find(k));
            assertEquals(k, index.first(e));
            assertEquals(0, index.second(e));
        });
        assertEquals(-1, index.find(Long.MIN_VALUE + 12345));
    }

    @Test
    void pairsOfLongsAreKeysInBothTheirParts() {
        Random r = new Random(23);
        ValueIndex index = ValueIndex.ofPairs();
        Map<List<Long>, Integer> reference = new HashMap<>();
        for (int i = 0; i < 40_000; i++) {
            long a = r.nextInt(200);
            long b = r.nextInt(200);
            int expected = reference.computeIfAbsent(List.of(a, b), x -> reference.size());
            assertEquals(expected, index.add(a, b));
        }
        reference.forEach((k, e) -> {
            assertEquals(k.get(0), index.first(e));
            assertEquals(k.get(1), index.second(e));
            assertEquals(e, index.find(k.get(0), k.get(1)));
        });
        assertEquals(-1, index.find(1, 200));
    }

    @Test
    void byteStringsAreNumberedAsAHashMapOfTheirTextNumbersThem() {
        Random r = new Random(29);
        ValueIndex index = ValueIndex.ofBytes();
        Map<String, Integer> reference = new HashMap<>();
        for (int i = 0; i < 40_000; i++) {
            String s = Integer.toString(r.nextInt(20_000), 36).repeat(1 + r.nextInt(3));
            byte[] framed = ("<<" + s + ">>").getBytes(StandardCharsets.UTF_8);
            int expected = reference.computeIfAbsent(s, x -> reference.size());
            assertEquals(expected, index.add(framed, 2, framed.length - 4, Integer.MAX_VALUE), s);
        }
        reference.forEach((s, e) -> {
            byte[] held = java.util.Arrays.copyOfRange(index.bytes(), index.offset(e), index.offset(e) + index.length(e));
            assertArrayEquals(s.getBytes(StandardCharsets.UTF_8), held, s);
        });
    }

    @Test
    void theEmptyStringIsAKeyLikeAnyOther() {
        ValueIndex index = ValueIndex.ofBytes();
        assertEquals(0, index.add(new byte[0], 0, 0, 10));
        assertEquals(1, index.add(new byte[] {0}, 0, 1, 10));
        assertEquals(0, index.add(new byte[5], 3, 0, 10));
    }

    @Test
    void aNewKeyBeyondTheLimitIsRefusedAndKnownKeysAreStillFound() {
        ValueIndex longs = ValueIndex.ofLongs();
        assertEquals(0, longs.add(5, 0, 2));
        assertEquals(1, longs.add(6, 0, 2));
        assertEquals(-1, longs.add(7, 0, 2));
        assertEquals(1, longs.add(6, 0, 2));
        assertEquals(2, longs.size());
        ValueIndex bytes = ValueIndex.ofBytes();
        assertEquals(0, bytes.add(new byte[] {1}, 0, 1, 1));
        assertEquals(-1, bytes.add(new byte[] {2}, 0, 1, 1));
        assertEquals(0, bytes.add(new byte[] {1}, 0, 1, 1));
    }

    @Test
    void anIndexRefusesKeysOfTheOtherKind() {
        assertThrows(IllegalStateException.class, () -> ValueIndex.ofBytes().add(1L));
        assertThrows(IllegalStateException.class, () -> ValueIndex.ofLongs().add(1L, 2L));
        assertThrows(IllegalStateException.class, () -> ValueIndex.ofLongs().add(new byte[1], 0, 1, 5));
        assertThrows(IndexOutOfBoundsException.class, () -> ValueIndex.ofLongs().first(0));
    }

    @Test
    void aCallersArrayGrowsByDoublingOnlyWhenTheEntryDoesNotFit() {
        assertEquals(8, ValueIndex.capacityFor(7, 8));
        assertEquals(16, ValueIndex.capacityFor(8, 8));
        assertEquals(1, ValueIndex.capacityFor(0, 0));
    }
}
