package dev.cairn.diagnostics;

/**
 * Convergence diagnostics of one parameter (Vehtari et al. 2021). Undefined values are NaN and
 * {@link #note()} says why in plain words; R-hat is +infinity for chains stuck at different values.
 *
 * @param rhat       max(rhatBulk, rhatFolded)
 * @param rhatBulk   R-hat of the rank-normalised split chains
 * @param rhatFolded R-hat of the rank-normalised split chains of |x - median|
 * @param essBulk    ESS of the rank-normalised split chains
 * @param essTail    min ESS of the split indicator chains I(x <= q05) and I(x <= q95)
 * @param essMean    ESS of the split chains themselves (for the MCSE of the mean)
 * @param mcseMean   sd / sqrt(essMean)
 * @param note       empty, or why something is undefined or limited
 */
public record ParameterDiagnostics(
        String name, int chains, int draws, double mean, double sd, double median,
        double rhat, double rhatBulk, double rhatFolded,
        double essBulk, double essTail, double essMean, double mcseMean,
        String note) {

    /** {@return whether every diagnostic is defined (false for a constant parameter or too few draws)} */
    public boolean defined() {
        return !Double.isNaN(rhat) && !Double.isNaN(essBulk) && !Double.isNaN(essTail);
    }
}
