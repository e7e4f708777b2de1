package dev.cairn.models;

import dev.cairn.diagnostics.Diagnostics;
import dev.cairn.diagnostics.DiagnosticsReport;
import dev.cairn.diagnostics.Thresholds;
import dev.cairn.models.spec.ConvergenceSpec;
import dev.cairn.models.spec.SamplerSpec;
import dev.cairn.models.spec.Spec;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.RunSettings;
import java.util.ArrayList;
import java.util.List;

/** What every model's fit does the same way: run settings, thresholds, diagnostics of all draws. */
public final class FitSupport {
    private FitSupport() {
    }

    /**
     * Run settings from the spec; threads from the options, else the spec, else one per chain up to the
     * processors. Exact sampling has no warmup and no thinning.
     *
     * @param spec    the spec (its sampler block)
     * @param options the caller's options (threads)
     * @param exact   whether the draws are exact
     * @return the settings
     */
    public static RunSettings runSettings(Spec spec, FitOptions options, boolean exact) {
        return runSettings(spec, options, exact, spec.samplerOrDefault().warmup());
    }

    /**
     * The same with the sampler's own default warmup where the spec gives none.
     *
     * @param spec          the spec
     * @param options       the caller's options (threads)
     * @param exact         whether the draws are exact (no warmup, no thinning)
     * @param defaultWarmup the warmup when the spec's sampler block gives none, >= 0
     * @return the settings
     */
    public static RunSettings runSettings(Spec spec, FitOptions options, boolean exact, int defaultWarmup) {
        SamplerSpec s = spec.samplerOrDefault();
        boolean given = spec.sampler() != null && spec.sampler().warmup() != null;
        int threads = options.threads() != null ? options.threads()
                : s.threads() != null ? s.threads()
                : Math.max(1, Math.min(s.chains(), Runtime.getRuntime().availableProcessors()));
        return new RunSettings(s.chains(), exact ? 0 : given ? s.warmup() : defaultWarmup, s.draws(),
                exact ? 1 : s.thin(), s.seed(), threads);
    }

    /**
     * The convergence thresholds of a spec's {@code convergence} block, defaults where it gives none.
     *
     * @param c the block, or null
     * @return the thresholds
     */
    public static Thresholds thresholds(ConvergenceSpec c) {
        if (c == null) {
            return Thresholds.DEFAULT;
        }
        return new Thresholds(c.maxRhat() == null ? Thresholds.DEFAULT.maxRhat() : c.maxRhat(),
                c.minEssPerChain() == null ? Thresholds.DEFAULT.minEssPerChain() : c.minEssPerChain());
    }

    /**
     * Diagnostics of every column of the draws (parameters and derived quantities).
     *
     * @param draws the draws
     * @param spec  the spec (its convergence thresholds)
     * @return the report with the verdict
     */
    public static DiagnosticsReport diagnose(Draws draws, Spec spec) {
        // columns copied one at a time as the diagnostics reach them, not all at once
        List<double[][]> columns = new java.util.AbstractList<>() {
            @Override
            public double[][] get(int i) {
                return draws.column(draws.names().get(i));
            }

            @Override
            public int size() {
                return draws.names().size();
            }
        };
        return Diagnostics.of(draws.names(), columns, thresholds(spec.convergence()));
    }

    /**
     * The control arm: the spec's, or the first in sorted order; at least two arms are needed. Used by
     * every model that compares arms.
     *
     * @param spec   the spec (its control)
     * @param arms   the arms in the data, sorted
     * @param source the data's name, for the message
     * @return the control arm
     * @throws InputException when there are fewer than two arms or the spec's control is not among them
     */
    public static String control(Spec spec, List<String> arms, String source) {
        if (arms.size() < 2) {
            throw new InputException(source + ": found " + arms.size() + " arm (" + String.join(", ", arms)
                    + "); a comparison needs at least two");
        }
        String control = spec.control() == null ? arms.get(0) : spec.control();
        if (!arms.contains(control)) {
            throw new InputException("/control: arm '" + control + "' is not in the data; arms found: "
                    + String.join(", ", arms));
        }
        return control;
    }

    /**
     * The sampler of a model without a closed-form posterior but with a gradient: "nuts" runs NUTS; "slice" and
     * "metropolis-within-gibbs" update one coordinate at a time through the same density; "auto" (or none) is
     * the model's best ({@code best}).
     *
     * @param requested the spec's sampler.method
     * @param model     the model's name, for the message
     * @param best      what "auto" means for this model
     * @param own       further methods only this model has (may be empty)
     * @return the method that runs
     * @throws InputException for a method the model does not have
     */
    public static String gradientMethod(String requested, String model, String best, String... own) {
        if (requested == null || requested.equals("auto")) {
            return best;
        }
        if (requested.equals("nuts") || requested.equals("slice") || requested.equals("metropolis-within-gibbs")
                || java.util.Arrays.asList(own).contains(requested)) {
            return requested;
        }
        List<String> allowed = new java.util.ArrayList<>(List.of("auto", "nuts", "slice", "metropolis-within-gibbs"));
        allowed.addAll(java.util.Arrays.asList(own));
        throw new InputException("/sampler/method: " + model + " has no closed-form posterior; use "
                + allowed.stream().map(a -> "'" + a + "'").collect(java.util.stream.Collectors.joining(", ")));
    }

    /** The warning put first in a result that did not converge. */
    /** Beyond it a draw's square, and so the posterior sd, overflows. */
    private static final double LARGEST_DRAW = 1e150;

    /**
     * Refuses draws that hold a non-finite value or one beyond 1e150 (whose square overflows): a quantity the model cannot represent in floating point
     * for these data and priors (an overflowing exp, say) ends the fit with one line, never in the result.
     *
     * @param draws the draws, with derived quantities
     * @param hint  what the user can do about it
     * @throws InputException naming the first such quantity
     */
    public static void requireFinite(Draws draws, String hint) {
        for (String name : draws.names()) {
            double[][] column = draws.column(name);
            for (int c = 0; c < column.length; c++) {
                for (int t = 0; t < column[c].length; t++) {
                    if (!(Math.abs(column[c][t]) <= LARGEST_DRAW)) {
                        throw new InputException(name + (Double.isFinite(column[c][t]) ? " exceeds 1e150" : " is not finite")
                                + " in chain " + (c + 1) + ", draw " + (t + 1) + ": " + hint);
                    }
                }
            }
        }
    }

    /**
     * The warning put first in a result that did not converge: the reasons and what to try.
     *
     * @param report the diagnostics
     * @return one line
     */
    public static String notConverged(DiagnosticsReport report) {
        int n = report.reasons().size();
        return "NOT converged (" + n + (n == 1 ? " check" : " checks") + " failed, listed in diagnostics.reasons): do "
                + "not use these numbers for decisions. " + report.advice();
    }
}
