package dev.cairn.samplers;

import org.apache.commons.rng.UniformRandomProvider;

/**
 * The mechanics under {@link NutsUpdater}: kinetic energy p' M^-1 p / 2 with a diagonal inverse metric on a
 * block of a {@link GradientTarget}'s coordinates, leapfrog steps, momentum draws and the first metric from
 * curvature. Per chain, mutable: {@link #inverseMetric} is the adapted metric (modified by the adaptation).
 */
final class Hamiltonian {
    final GradientTarget target;
    final int[] block;
    /** The block as one range [first, first + d) when its coordinates are consecutive, else -1. */
    final int first;
    final int d;
    final double[] inverseMetric;
    private final double[] fullGradient;
    private final UniformRandomProvider rng;
    private final org.apache.commons.rng.sampling.distribution.ZigguratSampler.NormalizedGaussian normal;

    Hamiltonian(GradientTarget target, int[] block, UniformRandomProvider stream) {
        this.rng = stream;
        this.normal = org.apache.commons.rng.sampling.distribution.ZigguratSampler.NormalizedGaussian.of(stream);
        this.target = target;
        this.block = block;
        boolean consecutive = true;
        for (int i = 1; i < block.length; i++) {
            consecutive &= block[i] == block[0] + i;
        }
        this.first = consecutive && block.length > 0 ? block[0] : -1;
        this.d = block.length;
        this.inverseMetric = new double[d];
        java.util.Arrays.fill(inverseMetric, 1);
        this.fullGradient = new double[target.parameters().size()];
    }

    /**
     * A first inverse metric before any draws exist: the inverse of the diagonal of the negative Hessian at
     * the starting point, estimated from eight Hessian-vector products with random
     * sign vectors v, diag(H) ~ mean of v * (H v) (Bekas, Kokiopoulou & Saad 2007, Applied Numerical
     * Mathematics 57(11-12):1214-1229), each H v a central difference of gradients. Coordinates whose
     * estimate is not a positive finite curvature keep the unit metric. Saves the long unit-metric
     * trajectories of the first warmup phase when coordinates differ in scale by orders of magnitude.
     */
    void curvatureMetric(double[] x) {
        double[] q = x.clone();
        double[] up = new double[fullGradient.length], down = new double[fullGradient.length];
        double[] sum = new double[d];
        int[] sign = new int[d];
        double h = 1e-4;
        for (int probe = 0; probe < NutsStep.CURVATURE_PROBES; probe++) {
            for (int i = 0; i < d; i++) {
                sign[i] = rng.nextBoolean() ? 1 : -1;
                q[block[i]] = x[block[i]] + h * sign[i];
            }
            double a = target.logDensityAndGradient(q, up);
            for (int i = 0; i < d; i++) {
                q[block[i]] = x[block[i]] - h * sign[i];
            }
            double b = target.logDensityAndGradient(q, down);
            if (!Double.isFinite(a) || !Double.isFinite(b)) {
                return;
            }
            for (int i = 0; i < d; i++) {
                int c = block[i];
                sum[i] -= sign[i] * (up[c] - down[c]) / (2 * h);
            }
        }
        for (int i = 0; i < d; i++) {
            double curvature = sum[i] / NutsStep.CURVATURE_PROBES;
            inverseMetric[i] = Double.isFinite(curvature) && curvature > 0
                    ? Math.min(1e6, Math.max(1e-10, 1 / curvature)) : 1;
        }
    }

    void drawMomentum(PhasePoint point) {
        for (int i = 0; i < d; i++) {
            point.p[i] = normal.sample() / Math.sqrt(inverseMetric[i]);
        }
    }

    /** H = -log p(q) + p' M^-1 p / 2; +infinity where the density is not finite. */
    double energy(PhasePoint point) {
        if (!Double.isFinite(point.logp)) {
            return Double.POSITIVE_INFINITY;
        }
        double k = 0;
        for (int i = 0; i < d; i++) {
            k += point.p[i] * point.p[i] * inverseMetric[i];
        }
        return -point.logp + 0.5 * k;
    }

    void sharp(PhasePoint point, double[] out) {
        for (int i = 0; i < d; i++) {
            out[i] = inverseMetric[i] * point.p[i];
        }
    }

    /** One leapfrog step of size eps (negative: backwards in time). Modifies the point. */
    void leapfrog(PhasePoint point, double eps) {
        double half = 0.5 * eps;
        for (int i = 0; i < d; i++) {
            point.p[i] += half * point.grad[i];
        }
        for (int i = 0; i < d; i++) {
            point.q[block[i]] += eps * inverseMetric[i] * point.p[i];
        }
        evaluate(point);
        for (int i = 0; i < d; i++) {
            point.p[i] += half * point.grad[i];
        }
    }

    /** Log density and the block's gradient at point.q; a non-finite value or gradient gives -infinity. */
    void evaluate(PhasePoint point) {
        double lp = target.logDensityAndGradient(point.q, fullGradient);
        boolean finite = Double.isFinite(lp);
        for (int i = 0; i < d; i++) {
            double g = fullGradient[block[i]];
            finite &= Double.isFinite(g);
            point.grad[i] = g;
        }
        if (!finite) {
            point.logp = Double.NEGATIVE_INFINITY;
            java.util.Arrays.fill(point.grad, 0);
        } else {
            point.logp = lp;
        }
    }

    static boolean noUTurn(double[] pSharpMinus, double[] pSharpPlus, double[] rhoSum) {
        double a = 0, b = 0;
        for (int i = 0; i < rhoSum.length; i++) {
            a += pSharpPlus[i] * rhoSum[i];
            b += pSharpMinus[i] * rhoSum[i];
        }
        return a > 0 && b > 0;
    }

    static double logSumExp(double a, double b) {
        if (a == Double.NEGATIVE_INFINITY) {
            return b;
        }
        if (b == Double.NEGATIVE_INFINITY) {
            return a;
        }
        double max = Math.max(a, b);
        return max + Math.log1p(Math.exp(-Math.abs(a - b)));
    }
}
