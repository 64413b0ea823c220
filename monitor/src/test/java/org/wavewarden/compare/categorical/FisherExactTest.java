package org.wavewarden.compare.categorical;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.wavewarden.compare.categorical.RandomTables.assertClose;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.TestResult;

class FisherExactTest {

    @Test
    void fisherMatchesTeaTastingExperiment() {
        // Fisher (1935), The Design of Experiments: two-sided p = 0.4857
        TestResult r = FisherExact.twoByTwo(3, 1, 1, 3);
        assertEquals(0.4857, r.pValue(), 0.00005);
        // R 4.2.2: fisher.test(matrix(c(3,1,1,3), 2, byrow = TRUE))$p.value
        assertClose(0.48571428571428582, r.pValue(), 1e-12, "p");
        assertEquals(3, r.statistic());
    }

    @Test
    void fisherMatchesROnSmallAndAsymmetricTables() {
        // R 4.2.2: fisher.test(matrix(c(a, b, c, d), 2, byrow = TRUE))$p.value
        assertClose(0.00053672411914343593, FisherExact.twoByTwo(10, 2, 3, 15).pValue(), 1e-10, "10 2 3 15");
        assertClose(0.0046620046620046603, FisherExact.twoByTwo(0, 5, 7, 1).pValue(), 1e-10, "0 5 7 1");
        assertClose(0.018306636155606393, FisherExact.twoByTwo(12, 5, 2, 8).pValue(), 1e-10, "12 5 2 8");
        assertClose(0.080495356037151689, FisherExact.twoByTwo(2, 9, 7, 4).pValue(), 1e-10, "2 9 7 4");
    }

    @Test
    void fisherStaysAccurateWithCountsInTheThousands() {
        // R 4.2.2: fisher.test(matrix(c(1523,1489,1320,1701), 2, byrow = TRUE))$p.value
        assertClose(9.296847358513814e-08, FisherExact.twoByTwo(1523, 1489, 1320, 1701).pValue(), 1e-7, "p");
        // R 4.2.2: fisher.test(matrix(c(50210,49790,49600,50400), 2, byrow = TRUE))$p.value
        assertClose(0.0064585808267340001, FisherExact.twoByTwo(50210, 49790, 49600, 50400).pValue(), 1e-7, "p");
    }

    @Test
    void swappingWavesOrOutcomesOrTransposingLeavesPUnchanged() {
        Random random = new Random(5L);
        for (int rep = 0; rep < 300; rep++) {
            long a = random.nextInt(30);
            long b = random.nextInt(30);
            long c = random.nextInt(30);
            long d = random.nextInt(30);
            double p = FisherExact.twoByTwo(a, b, c, d).pValue();
            assertTrue(p > 0 && p <= 1);
            assertClose(p, FisherExact.twoByTwo(c, d, a, b).pValue(), 1e-9, "waves swapped");
            assertClose(p, FisherExact.twoByTwo(b, a, d, c).pValue(), 1e-9, "outcomes swapped");
            assertClose(p, FisherExact.twoByTwo(a, c, b, d).pValue(), 1e-9, "transposed");
        }
    }

    @Test
    void negativeCountIsRejectedByName() {
        assertTrue(assertThrows(IllegalArgumentException.class, () -> FisherExact.twoByTwo(1, 2, -3, 4))
                .getMessage().startsWith("c "));
    }
}
