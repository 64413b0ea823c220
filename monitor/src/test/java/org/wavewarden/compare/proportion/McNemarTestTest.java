package org.wavewarden.compare.proportion;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.TestResult;

class McNemarTestTest {

    @Test
    void mcNemarMatchesAgrestiPresidentialApprovalTable() {
        // Agresti (2007), section 10.1 (CHECK-SOURCES: 794 / 150 / 86 / 570)
        TestResult plain = McNemarTest.test(794, 150, 86, 570, false);
        assertEquals(-4.17, McNemarTest.signedZ(794, 150, 86, 570), 0.005);
        assertEquals(17.36, plain.statistic(), 0.005);
        TestResult corrected = McNemarTest.test(794, 150, 86, 570, true);
        assertEquals(16.82, corrected.statistic(), 0.005);
        assertEquals(4.11e-05, corrected.pValue(), 0.005e-05);
        // R 4.2.2: mcnemar.test(matrix(c(794, 150, 86, 570), 2, byrow = TRUE), correct = FALSE / TRUE)
        assertEquals(17.35593220338983, plain.statistic(), 1e-12);
        assertEquals(3.0992934410452182e-05, plain.pValue(), 1e-14);
        assertEquals(16.817796610169491, corrected.statistic(), 1e-12);
        assertEquals(4.1145622813459436e-05, corrected.pValue(), 1e-14);
        assertEquals(1, plain.df());
    }

    @Test
    void swappingWavesFlipsZAndKeepsP() {
        Random random = new Random(53L);
        for (int rep = 0; rep < 200; rep++) {
            long a = random.nextInt(100);
            long b = random.nextInt(100);
            long c = random.nextInt(100);
            long d = random.nextInt(100);
            // swapping waves turns yes-then-no into no-then-yes
            assertEquals(McNemarTest.signedZ(a, b, c, d), -McNemarTest.signedZ(a, c, b, d), 1e-12);
            for (boolean cc : new boolean[] {false, true}) {
                assertEquals(McNemarTest.test(a, b, c, d, cc).pValue(), McNemarTest.test(a, c, b, d, cc).pValue(),
                        1e-15);
                // concordant pairs carry no information
                assertEquals(McNemarTest.test(a, b, c, d, cc), McNemarTest.test(a + 7, b, c, d + 3, cc));
            }
            double z = McNemarTest.signedZ(a, b, c, d);
            assertEquals(z * z, McNemarTest.test(a, b, c, d, false).statistic(), 1e-9);
        }
    }

    @Test
    void noDiscordantPairsMeansNoEvidence() {
        TestResult r = McNemarTest.test(40, 0, 0, 60, true);
        assertEquals(0, r.statistic());
        assertEquals(1, r.pValue());
        assertTrue(assertThrows(IllegalArgumentException.class, () -> McNemarTest.test(1, -1, 0, 0, false))
                .getMessage().startsWith("yesNo"));
    }
}
