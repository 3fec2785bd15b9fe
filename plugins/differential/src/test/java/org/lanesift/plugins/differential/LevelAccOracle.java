package org.lanesift.plugins.differential;

import org.lanesift.kit.DitheredStride;

/**
 * The level statistics loop as it was before the samples were split by comparator state (one
 * sample at a time, a branch on the state): the reference {@link LevelAccTest} compares
 * {@link LevelAcc#add} with, field by field and bit for bit.
 */
final class LevelAccOracle {
    private LevelAccOracle() {
    }

    static void add(LevelAcc acc, float[] a, int ao, float[] b, int bo, long base, int s0, int s1, long[] bits, long[] inv, float thr,
                    float half, float settled, int stride, float maxAbsVolts) {
        acc.samples += s1 - s0;
        // accumulate in locals (registers), in the same order as one sample at a time, and write back once, so the
        // sums do not depend on where the segments start
        long n0 = acc.n[0];
        long n1 = acc.n[1];
        double sum0 = acc.sum[0];
        double sum1 = acc.sum[1];
        double sq0 = acc.sq[0];
        double sq1 = acc.sq[1];
        double cm0 = acc.cmSum[0];
        double cm1 = acc.cmSum[1];
        double cq0 = acc.cmSq[0];
        double cq1 = acc.cmSq[1];
        double min0 = acc.min[0];
        double min1 = acc.min[1];
        double max0 = acc.max[0];
        double max1 = acc.max[1];
        long r0 = acc.nRaw[0];
        long r1 = acc.nRaw[1];
        double rs0 = acc.sumRaw[0];
        double rs1 = acc.sumRaw[1];
        double rc0 = acc.cmRaw[0];
        double rc1 = acc.cmRaw[1];
        double rq0 = acc.sqRaw[0];
        double rq1 = acc.sqRaw[1];
        double rcq0 = acc.cqRaw[0];
        double rcq1 = acc.cqRaw[1];
        // one sample per run of stride samples, at the run's hashed offset (runs counted from the stream start)
        long from = base + s0;
        long to = base + s1;
        for (long run = Math.floorDiv(from, stride); ; run++) {
            long k = run * stride + DitheredStride.offset(run, stride);
            if (k < from) {
                continue;
            }
            if (k >= to) {
                break;
            }
            int i = (int) (k - base);
            if (inv != null && (inv[i >>> 6] & (1L << i)) != 0) {
                continue;
            }
            float x = a[ao + i];
            float y = b == null ? 0f : b[bo + i];
            float d = b == null ? x : x - y;
            float dist = Math.abs(d - thr);
            if (dist < half || Math.abs(d) > maxAbsVolts) {
                continue;
            }
            double cm = 0.5 * ((double) x + y);
            boolean isSettled = dist >= settled;
            if ((bits[i >>> 6] & (1L << i)) != 0) {
                r1++;
                rs1 += d;
                rc1 += cm;
                rq1 += (double) d * d;
                rcq1 += cm * cm;
                min1 = d < min1 ? d : min1;
                max1 = d > max1 ? d : max1;
                if (isSettled) {
                    n1++;
                    sum1 += d;
                    sq1 += (double) d * d;
                    cm1 += cm;
                    cq1 += cm * cm;
                }
            } else {
                r0++;
                rs0 += d;
                rc0 += cm;
                rq0 += (double) d * d;
                rcq0 += cm * cm;
                min0 = d < min0 ? d : min0;
                max0 = d > max0 ? d : max0;
                if (isSettled) {
                    n0++;
                    sum0 += d;
                    sq0 += (double) d * d;
                    cm0 += cm;
                    cq0 += cm * cm;
                }
            }
        }
        acc.nRaw[0] = r0;
        acc.nRaw[1] = r1;
        acc.sumRaw[0] = rs0;
        acc.sumRaw[1] = rs1;
        acc.cmRaw[0] = rc0;
        acc.cmRaw[1] = rc1;
        acc.sqRaw[0] = rq0;
        acc.sqRaw[1] = rq1;
        acc.cqRaw[0] = rcq0;
        acc.cqRaw[1] = rcq1;
        acc.n[0] = n0;
        acc.n[1] = n1;
        acc.sum[0] = sum0;
        acc.sum[1] = sum1;
        acc.sq[0] = sq0;
        acc.sq[1] = sq1;
        acc.min[0] = min0;
        acc.min[1] = min1;
        acc.max[0] = max0;
        acc.max[1] = max1;
        if (b != null) {
            acc.cmSum[0] = cm0;
            acc.cmSum[1] = cm1;
            acc.cmSq[0] = cq0;
            acc.cmSq[1] = cq1;
        }
        if (inv != null) {
            for (int i = s0; i < s1; i++) {
                if ((inv[i >>> 6] & (1L << i)) != 0) {
                    acc.invalid++;
                }
            }
        }
        acc.endIndex = base + s1;
    }
}
