package org.wavewarden.bench;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

import java.util.Arrays;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * The bench's page times are summarised by the nearest-rank percentile: the smallest sample with at least p% of the
 * samples at or below it, always a time that was measured. That is R's quantile(x, p, type = 1).
 */
class ConsoleBenchPercentileTest {

    @ParameterizedTest(name = "{1}th percentile of [{0}] is {2}")
    @CsvSource(delimiter = '|', value = {
            // Reference values: R 4.2.2, stats::quantile(x, p, type = 1)
            "12.5 3.1 7.7 40.2 5.0 9.9 1.2 18.4 6.6 2.8 | 50  | 6.6",
            "12.5 3.1 7.7 40.2 5.0 9.9 1.2 18.4 6.6 2.8 | 95  | 40.2",
            "12.5 3.1 7.7 40.2 5.0 9.9 1.2 18.4 6.6 2.8 | 100 | 40.2",
            "12.5 3.1 7.7 40.2 5.0 9.9 1.2 18.4 6.6 2.8 | 10  | 1.2",
            "4 1 3 2                                    | 50  | 2",
            "4 1 3 2                                    | 95  | 4",
            "4 1 3 2                                    | 25  | 1",
    })
    void aPercentileIsTheNearestRankAsRsQuantileType1(String samples, double p, double expected) {
        double[] x = Arrays.stream(samples.trim().split("\\s+")).mapToDouble(Double::parseDouble).toArray();
        assertEquals(expected, ConsoleBench.percentile(x, p));
    }
}
