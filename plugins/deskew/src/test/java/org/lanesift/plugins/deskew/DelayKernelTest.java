package org.lanesift.plugins.deskew;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/**
 * Measures the passband error the Javadoc of {@link DelayKernel} and docs/skew-table.md state.
 * Reference: the ideal fractional delay has frequency response exp(-i 2 pi f d) (any signal
 * processing textbook's shift theorem of the discrete-time Fourier transform; from memory).
 */
class DelayKernelTest {

    @Test
    void sincPassbandErrorIsAsDocumented() {
        double e40 = DelayKernel.SINC.passbandError(0.4);
        double e25 = DelayKernel.SINC.passbandError(0.25);
        System.out.printf("sinc passband error: %.5f up to 0.4 fs, %.5f up to 0.25 fs%n", e40, e25);
        assertTrue(e40 < 0.0051, "sinc error up to 0.4 fs " + e40);
        assertTrue(e40 > 0.004, "documented figure 0.50 % should still describe the kernel: " + e40);
        assertTrue(e25 < 0.0027, "sinc error up to 0.25 fs " + e25);
    }

    @Test
    void cubicPassbandErrorIsAsDocumented() {
        double e05 = DelayKernel.CUBIC.passbandError(0.05);
        double e10 = DelayKernel.CUBIC.passbandError(0.1);
        double e25 = DelayKernel.CUBIC.passbandError(0.25);
        double e40 = DelayKernel.CUBIC.passbandError(0.4);
        System.out.printf("cubic passband error: %.5f @0.05, %.5f @0.1, %.5f @0.25, %.5f @0.4%n", e05, e10, e25, e40);
        assertTrue(e05 < 0.0006, "cubic 0.05: " + e05);
        assertTrue(e10 < 0.0045, "cubic 0.1: " + e10);
        assertTrue(e25 < 0.117, "cubic 0.25: " + e25);
        assertTrue(e40 < 0.552, "cubic 0.4: " + e40);
        assertTrue(e40 > 0.5, "cubic is documented as poor at 0.4 fs: " + e40);
    }

    @Test
    void tapsHaveUnitDcGainAndAWholeDelayIsExact() {
        for (DelayKernel k : DelayKernel.values()) {
            for (double mu : new double[] {0.1, 0.25, 0.5, 0.9}) {
                double s = 0;
                for (double h : k.tapsDouble(mu)) {
                    s += h;
                }
                assertEquals(1.0, s, 1e-12);
            }
            assertEquals(1, k.tapsDouble(0).length);
        }
    }

    @Test
    void besselI0MatchesTabulatedValues() {
        // Abramowitz and Stegun, Handbook of Mathematical Functions, table 9.8: I0(1) = 1.266065878, I0(5) = 27.23987182
        assertEquals(1.266065878, DelayKernel.besselI0(1), 1e-9);
        assertEquals(27.23987182, DelayKernel.besselI0(5), 1e-7);
    }
}
