package org.lanesift.kit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

class DitheredStrideTest {
    @Test
    void strideOneTakesEverySample() {
        for (long i = -5; i < 1000; i++) {
            assertTrue(DitheredStride.taken(i, 1));
            assertTrue(DitheredStride.taken(i, 0));
        }
    }

    @Test
    void takesOneInStrideOnAverage() {
        for (int stride : new int[] {2, 7, 16, 64}) {
            long taken = 0;
            int n = 1_000_000;
            for (long i = 0; i < n; i++) {
                if (DitheredStride.taken(i, stride)) {
                    taken++;
                }
            }
            double expected = (double) n / stride;
            // binomial: within 5 standard deviations
            assertEquals(expected, taken, 5 * Math.sqrt(expected));
        }
    }

    @Test
    void seesEveryPhaseOfAPeriodThatAFixedStrideAliasesWith() {
        // 80 samples per clock period, stride 16: a fixed stride sees phases 0, 16, 32, 48 and 64 only
        int period = 80;
        long[] perPhase = new long[period];
        double sum = 0;
        long count = 0;
        for (long i = 0; i < 800_000; i++) {
            if (DitheredStride.taken(i, 16)) {
                int phase = (int) (i % period);
                perPhase[phase]++;
                sum += phase;
                count++;
            }
        }
        for (int p = 0; p < period; p++) {
            assertTrue(perPhase[p] > 400, "phase " + p + " taken " + perPhase[p] + " times");
        }
        // the mean phase of the taken samples is the mean over the period, 39.5 (a fixed stride gives 32)
        assertEquals(39.5, sum / count, 0.5);
    }
}
