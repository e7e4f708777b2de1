package dev.cairn.models.pooled;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.diagnostics.Mcse;
import dev.cairn.diagnostics.Quantiles;
import dev.cairn.models.data.Estimates;
import dev.cairn.models.spec.PriorsSpec;
import dev.cairn.samplers.Cancellation;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.Progress;
import dev.cairn.samplers.RunSettings;
import java.util.List;
import java.util.function.DoubleUnaryOperator;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

/**
 * The eight schools (Gelman et al., Bayesian Data Analysis 3rd ed., Table 5.2: estimated coaching effects
 * and their standard errors). With a uniform prior on tau, the exact marginal posterior of tau is
 * computed here by 1-D quadrature (BDA3 eq. 5.21), and those of mu and every theta_j as mixtures of the
 * normal conditionals over that tau grid (eqs. 5.17-5.20); the sampler's medians and 95% limits must agree
 * within 4 Monte Carlo standard errors (plus a small allowance for the grid).
 */
class EightSchoolsTest {
    static final double[] Y = {28, 8, -3, 7, -1, 1, 18, 12};
    static final double[] SE = {15, 10, 16, 11, 9, 11, 10, 18};
    static final List<String> NAMES = List.of("A", "B", "C", "D", "E", "F", "G", "H");
    static final Estimates DATA = new Estimates(NAMES, Y, SE, "BDA3 Table 5.2", "");
    static final double UPPER = 200;
    static final int GRID = 4_000;

    /** Posterior weights of tau on a midpoint grid over (0, UPPER) with p(tau) uniform (BDA3 eq. 5.21). */
    static double[][] tauGrid() {
        double[] tau = new double[GRID];
        double[] logw = new double[GRID];
        double max = Double.NEGATIVE_INFINITY;
        for (int g = 0; g < GRID; g++) {
            tau[g] = (g + 0.5) * UPPER / GRID;
            double prec = 0, wy = 0;
            for (int j = 0; j < Y.length; j++) {
                double w = 1 / (SE[j] * SE[j] + tau[g] * tau[g]);
                prec += w;
                wy += w * Y[j];
            }
            double muHat = wy / prec;
            double lp = -0.5 * Math.log(prec);
            for (int j = 0; j < Y.length; j++) {
                double v = SE[j] * SE[j] + tau[g] * tau[g];
                lp += -0.5 * Math.log(v) - (Y[j] - muHat) * (Y[j] - muHat) / (2 * v);
            }
            logw[g] = lp;
            max = Math.max(max, lp);
        }
        double total = 0;
        double[] w = new double[GRID];
        for (int g = 0; g < GRID; g++) {
            w[g] = Math.exp(logw[g] - max);
            total += w[g];
        }
        for (int g = 0; g < GRID; g++) {
            w[g] /= total;
        }
        return new double[][] {tau, w};
    }

    /** Quantile of a distribution given its CDF, by bisection. */
    static double quantile(DoubleUnaryOperator cdf, double p, double lo, double hi) {
        for (int i = 0; i < 50; i++) {
            double mid = (lo + hi) / 2;
            if (cdf.applyAsDouble(mid) < p) {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        return (lo + hi) / 2;
    }

    /** CDF of theta_j (j = -1: mu) at x: mixture over the tau grid of the normal conditionals. */
    static double mixtureCdf(double[][] grid, int j, double x) {
        NormalDistribution std = new NormalDistribution();
        double c = 0;
        for (int g = 0; g < GRID; g++) {
            double t2 = grid[0][g] * grid[0][g];
            double prec = 0, wy = 0;
            for (int k = 0; k < Y.length; k++) {
                double w = 1 / (SE[k] * SE[k] + t2);
                prec += w;
                wy += w * Y[k];
            }
            double muHat = wy / prec, vMu = 1 / prec;
            double mean, var;
            if (j < 0) {
                mean = muHat;
                var = vMu;
            } else {
                double pj = 1 / (SE[j] * SE[j]) + 1 / t2;
                double b = (1 / t2) / pj;
                mean = (Y[j] / (SE[j] * SE[j]) + muHat / t2) / pj;
                var = 1 / pj + b * b * vMu;
            }
            c += grid[1][g] * std.cumulativeProbability((x - mean) / Math.sqrt(var));
        }
        return c;
    }

    @Test
    void samplerMatchesQuadrature() {
        PooledPriors priors = PooledPriors.of(new PriorsSpec(null, null, null, null, null, null,
                new PriorsSpec.TauPrior("uniform", 0.0, UPPER, null, null)), DATA);
        Draws d = PooledEffectsPosterior.sample(DATA, priors, RunSettings.of(4, 1000, 10_000, 8), Progress.NONE,
                new Cancellation());
        double[][] grid = tauGrid();
        for (double p : new double[] {0.025, 0.5, 0.975}) {
            double tauRef = quantile(x -> {
                double c = 0;
                for (int g = 0; g < GRID && grid[0][g] <= x; g++) {
                    c += grid[1][g];
                }
                return c;
            }, p, 0, UPPER);
            check(d, PooledEffectsPosterior.TAU, p, tauRef, UPPER / GRID);
            check(d, PooledEffectsPosterior.MU, p, quantile(x -> mixtureCdf(grid, -1, x), p, -100, 100), 0.05);
            for (int j = 0; j < Y.length; j++) {
                int k = j;
                check(d, PooledEffectsPosterior.effect(NAMES.get(j)), p,
                        quantile(x -> mixtureCdf(grid, k, x), p, -150, 150), 0.05);
            }
        }
    }

    private static void check(Draws d, String name, double p, double reference, double gridError) {
        double q = Quantiles.of(d.pooled(name), p);
        double tolerance = 4 * Mcse.quantile(d.column(name), p) + gridError;
        assertTrue(Math.abs(q - reference) <= tolerance,
                name + " q" + p + ": sampler " + q + ", quadrature " + reference + " (tolerance " + tolerance + ")");
    }

    /**
     * Against an independent sampler: the same model (flat mu, uniform tau on (0, 200)) sampled with
     * 200,000 draws by the NUTS implementation of Debian's R packages, quantiles and their MCSEs as in
     * Vehtari et al. (2021) (fixtures/reference/eight-schools: script, model and versions beside the values).
     * cairn's quantiles agree within 4 combined MCSEs.
     */
    @Test
    void samplerMatchesStan() throws java.io.IOException {
        List<String> rows = java.nio.file.Files.readAllLines(java.nio.file.Path.of("..", "fixtures", "reference",
                "eight-schools", "reference.csv")).stream().filter(l -> !l.startsWith("#")).toList();
        PooledPriors priors = PooledPriors.of(new PriorsSpec(null, null, null, null, null, null,
                new PriorsSpec.TauPrior("uniform", 0.0, UPPER, null, null)), DATA);
        Draws d = PooledEffectsPosterior.sample(DATA, priors, RunSettings.of(4, 1000, 10_000, 9), Progress.NONE,
                new Cancellation());
        double[] probs = {0.025, 0.5, 0.975};
        for (String row : rows.subList(1, rows.size())) {
            String[] v = row.split(",");
            String quantity = v[0].trim();
            String name = quantity.equals("mu") ? PooledEffectsPosterior.MU : quantity.equals("tau")
                    ? PooledEffectsPosterior.TAU
                    : PooledEffectsPosterior.effect(NAMES.get(Integer.parseInt(quantity.replaceAll("\\D", "")) - 1));
            for (int i = 0; i < probs.length; i++) {
                double reference = Double.parseDouble(v[1 + i].trim()), referenceMcse = Double.parseDouble(v[4 + i].trim());
                double ours = Quantiles.of(d.pooled(name), probs[i]);
                double mcse = Mcse.quantile(d.column(name), probs[i]);
                double tolerance = 4 * Math.hypot(mcse, referenceMcse);
                assertTrue(Math.abs(ours - reference) <= tolerance, name + " q" + probs[i] + ": cairn " + ours
                        + ", reference " + reference + " (tolerance " + tolerance + ")");
            }
        }
    }

    /**
     * Complete pooling (BDA3 section 5.5): the precision-weighted mean of the eight estimates is 7.7 with
     * standard error 4.1 (values as printed in the book, recalled from memory).
     */
    @Test
    void completePoolingEstimate() {
        double prec = 0, wy = 0;
        for (int j = 0; j < Y.length; j++) {
            prec += 1 / (SE[j] * SE[j]);
            wy += Y[j] / (SE[j] * SE[j]);
        }
        assertEquals(7.7, wy / prec, 0.05);
        assertEquals(4.1, Math.sqrt(1 / prec), 0.05);
        // and the hierarchical model's marginal for tau -> 0 reduces to it: mu_hat(tau ~ 0) is the same number
        PooledEffectsPosterior m = new PooledEffectsPosterior(DATA, PooledPriors.of(new PriorsSpec(null, null, null,
                null, null, null, new PriorsSpec.TauPrior("uniform", 0.0, UPPER, null, null)), DATA));
        assertEquals(wy / prec, m.muGivenTau(1e-9)[0], 1e-9);
        assertEquals(1 / prec, m.muGivenTau(1e-9)[1], 1e-9);
    }
}
