package dev.cairn.diagnostics;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * Diagnostics of every parameter and the verdict. Converged when every defined R-hat is below the
 * threshold and every defined bulk- and tail-ESS reaches the per-chain minimum times the number of
 * chains; {@link #reasons()} lists each failure. Constant parameters are listed as notes, not failures.
 */
public record DiagnosticsReport(List<ParameterDiagnostics> parameters, Thresholds thresholds,
                                double maxRhat, double minEssBulk, double minEssTail,
                                boolean converged, List<String> reasons, List<String> notes) {

    public DiagnosticsReport {
        parameters = List.copyOf(parameters);
        reasons = List.copyOf(reasons);
        notes = List.copyOf(notes);
    }

    /**
     * The report of already diagnosed parameters: the worst R-hat and ESS over them and the verdict.
     *
     * @param parameters each parameter's diagnostics
     * @param thresholds the convergence thresholds
     * @return the report
     */
    public static DiagnosticsReport of(List<ParameterDiagnostics> parameters, Thresholds thresholds) {
        double maxRhat = Double.NaN, minBulk = Double.NaN, minTail = Double.NaN;
        List<String> reasons = new ArrayList<>();
        List<String> notes = new ArrayList<>();
        for (ParameterDiagnostics p : parameters) {
            if (!p.note().isEmpty()) {
                notes.add(p.name() + ": " + p.note());
            }
            if (!Double.isNaN(p.rhat())) {
                maxRhat = Double.isNaN(maxRhat) ? p.rhat() : Math.max(maxRhat, p.rhat());
            }
            if (!Double.isNaN(p.essBulk())) {
                minBulk = Double.isNaN(minBulk) ? p.essBulk() : Math.min(minBulk, p.essBulk());
            }
            if (!Double.isNaN(p.essTail())) {
                minTail = Double.isNaN(minTail) ? p.essTail() : Math.min(minTail, p.essTail());
            }
            if (p.rhat() == p.rhat() && !(p.rhat() < thresholds.maxRhat())) {
                reasons.add(String.format(Locale.ROOT, "R-hat of %s is %s (must be < %s)", p.name(),
                        format(p.rhat()), format(thresholds.maxRhat())));
            }
            double need = thresholds.minEssPerChain() * p.chains();
            if (p.essBulk() == p.essBulk() && p.essBulk() < need) {
                reasons.add(String.format(Locale.ROOT, "bulk-ESS of %s is %.0f (needs >= %.0f)", p.name(), p.essBulk(), need));
            }
            if (p.essTail() == p.essTail() && p.essTail() < need) {
                reasons.add(String.format(Locale.ROOT, "tail-ESS of %s is %.0f (needs >= %.0f)", p.name(), p.essTail(), need));
            }
            if (!p.defined() && !(p.sd() == 0)) {
                reasons.add(undefined(p));
            }
        }
        if (parameters.isEmpty()) {
            reasons.add("no parameters to diagnose");
        }
        return new DiagnosticsReport(parameters, thresholds, maxRhat, minBulk, minTail, reasons.isEmpty(),
                reasons, notes);
    }

    /** Margin on the draws the observed ESS per draw implies: ESS estimates are themselves noisy. */
    static final double ADVICE_MARGIN = 1.2;

    /**
     * What to do when the fit did not converge, computed from the run: where an ESS falls short, the draws
     * per chain that the ESS per draw seen implies for the threshold (the worst quantity's shortfall, with a
     * 20% margin: ESS grows about linearly with the draws once the chains have mixed); where R-hat fails, that
     * the chains disagree and need more warmup or draws.
     *
     * @return one sentence or two; null when the fit converged
     */
    public String advice() {
        if (converged) {
            return null;
        }
        double factor = 1;
        int draws = 0;
        boolean rhat = false;
        for (ParameterDiagnostics p : parameters) {
            double need = thresholds.minEssPerChain() * p.chains();
            for (double ess : new double[] {p.essBulk(), p.essTail()}) {
                if (ess == ess && ess > 0 && ess < need) {
                    factor = Math.max(factor, need / ess);
                    draws = p.draws();
                }
            }
            rhat |= p.rhat() == p.rhat() && !(p.rhat() < thresholds.maxRhat());
        }
        StringBuilder sb = new StringBuilder();
        if (factor > 1 && draws > 0) {
            long needed = (long) Math.ceil(draws * factor * ADVICE_MARGIN / 100.0) * 100;
            sb.append(String.format(Locale.ROOT, "At the ESS per draw seen, about %,d draws per chain (now %,d) would "
                    + "meet the ESS thresholds (sampler.draws).", needed, draws));
        }
        if (rhat) {
            sb.append(sb.length() > 0 ? " " : "").append(String.format(Locale.ROOT, "R-hat at or above %s means the "
                    + "chains disagree: give more warmup and draws (sampler.warmup, sampler.draws); if it stays, the "
                    + "posterior may have separate modes or the model may not suit the data.",
                    format(thresholds.maxRhat())));
        }
        return sb.length() == 0 ? "Some diagnostics are undefined; see the reasons." : sb.toString();
    }

    /** "R-hat and tail-ESS of x are undefined: why", naming the diagnostics that are missing. */
    private static String undefined(ParameterDiagnostics p) {
        List<String> which = new ArrayList<>();
        if (Double.isNaN(p.rhat())) {
            which.add("R-hat");
        }
        if (Double.isNaN(p.essBulk())) {
            which.add("bulk-ESS");
        }
        if (Double.isNaN(p.essTail())) {
            which.add("tail-ESS");
        }
        if (which.isEmpty()) {
            return "diagnostics of " + p.name() + " are undefined" + (p.note().isEmpty() ? "" : ": " + p.note());
        }
        String list = which.size() == 1 ? which.get(0)
                : String.join(", ", which.subList(0, which.size() - 1)) + " and " + which.get(which.size() - 1);
        return list + " of " + p.name() + (which.size() == 1 ? " is" : " are") + " undefined"
                + (p.note().isEmpty() ? "" : ": " + p.note());
    }

    private static String format(double v) {
        return Double.isInfinite(v) ? "infinite" : String.format(Locale.ROOT, "%.3f", v);
    }
}
