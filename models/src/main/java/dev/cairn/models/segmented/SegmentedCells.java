package dev.cairn.models.segmented;

import dev.cairn.models.data.ArmStats;
import dev.cairn.models.data.SegmentedSpendData;
import java.util.List;

/**
 * The data of a segmented-spend fit as the density reads it: per cell (segment j, arm k) the users n, payers
 * m and payers' sums of log spend S1 and squared log spend S2; a cell with no users is absent and contributes
 * no likelihood.
 */
final class SegmentedCells {
    final List<String> segments;
    final List<String> arms;
    final int control;
    final boolean spend;
    final double[][] n, m, s1, s2;
    final boolean[][] present;
    /** The same per cell, segment-major (cell j * arms + k), for the density's loops. */
    final double[] users, payers, logSpendSum, logSpendSqSum;

    SegmentedCells(SegmentedSpendData data, String controlArm) {
        this.segments = data.segments();
        this.arms = data.arms();
        this.control = arms.indexOf(controlArm);
        this.spend = data.hasSpend();
        int segs = segments.size(), armCount = arms.size();
        n = new double[segs][armCount];
        m = new double[segs][armCount];
        s1 = new double[segs][armCount];
        s2 = new double[segs][armCount];
        present = new boolean[segs][armCount];
        for (int j = 0; j < segs; j++) {
            for (int k = 0; k < armCount; k++) {
                ArmStats c = data.cell(segments.get(j), arms.get(k));
                if (c != null && c.users() > 0) {
                    present[j][k] = true;
                    n[j][k] = c.users();
                    m[j][k] = c.payers();
                    if (spend && c.payers() > 0) {
                        s1[j][k] = c.logSpendSum();
                        s2[j][k] = c.logSpendSqSum();
                    }
                }
            }
        }
        users = flat(n);
        payers = flat(m);
        logSpendSum = flat(s1);
        logSpendSqSum = flat(s2);
    }

    private static double[] flat(double[][] a) {
        int arms = a.length == 0 ? 0 : a[0].length;
        double[] out = new double[a.length * arms];
        for (int j = 0; j < a.length; j++) {
            System.arraycopy(a[j], 0, out, j * arms, arms);
        }
        return out;
    }

    int segmentCount() {
        return segments.size();
    }

    int armCount() {
        return arms.size();
    }

    /** Payers of segment j over all arms: the information its data carry about the segment's levels. */
    double segmentPayers(int j) {
        double s = 0;
        for (int k = 0; k < arms.size(); k++) {
            s += m[j][k];
        }
        return s;
    }

    /**
     * The information segment j's data carry about an arm effect, in payers: the smallest over arms of
     * 1 / (1/m_control + 1/m_k) (the precision of a difference of two logits or two mean log spends, in
     * units of one payer's).
     */
    double effectPayers(int j) {
        double least = Double.POSITIVE_INFINITY;
        for (int k = 0; k < arms.size(); k++) {
            if (k == control) {
                continue;
            }
            double a = m[j][control], b = m[j][k];
            least = Math.min(least, a > 0 && b > 0 ? 1 / (1 / a + 1 / b) : 0);
        }
        return least == Double.POSITIVE_INFINITY ? 0 : least;
    }
}
