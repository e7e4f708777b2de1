package dev.cairn.models.result;

import java.util.List;

/**
 * What every model's result has: the parts the terminal, the report and other tools can show for any model.
 * Each model's result is its own record implementing this (a new model's result needs no change here; the
 * command line shows an unknown result type through these parts alone).
 */
public interface FitResult {
    /** {@return the spec's model name} */
    String model();

    /** {@return the spec's title, or null} */
    String title();

    /** {@return whether every quantity passed the convergence thresholds} */
    boolean converged();

    /** {@return where the data came from and how much was read} */
    DataInfo data();

    /** {@return the convergence diagnostics block} */
    DiagnosticsSummary diagnostics();

    /** {@return what ran: sampler, chains, draws, seed, seconds, version} */
    Run run();

    /** {@return warnings, the not-converged one first} */
    List<String> warnings();

    /** {@return the cautions shown with every result} */
    List<String> cautions();

    /** {@return what to do on the primary metric, or null for a model without arms to choose from} */
    default Decision decision() {
        return null;
    }

    /** {@return the priors the fit used (given or default, with their source), or null} */
    default PriorsUsed priors() {
        return null;
    }

    /** {@return the control arm, or null for a model without one} */
    default String control() {
        return null;
    }

    /** {@return "spec" when the spec named the control, "default" when cairn chose it, null without one} */
    default String controlSource() {
        return null;
    }

    /** {@return the ISO 4217 code of money figures, or null when the spec gives none} */
    default String currency() {
        return null;
    }

    /** {@return the comparisons of arms against the control (none for a model without arms)} */
    default List<Comparison> comparisons() {
        return List.of();
    }
}
