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
    void takesExactlyOneInEachRunAndNextAgreesWithTaken() {
        for (int stride : new int[] {2, 7, 16, 64}) {
            long previous = -1;
            for (long run = -3; run < 20_000; run++) {
                int inRun = 0;
                for (long i = run * stride; i < (run + 1) * stride; i++) {
                    if (DitheredStride.taken(i, stride)) {
                        inRun++;
                        // oracle for next(): a plain scan forward with taken()
                        for (long from = previous + 1; from <= i; from++) {
                            assertEquals(i, DitheredStride.next(from, stride));
                        }
                        previous = i;
                    }
                }
                assertEquals(1, inRun, "run " + run + " of stride " + stride);
            }
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
