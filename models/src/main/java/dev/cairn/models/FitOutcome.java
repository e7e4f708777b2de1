package dev.cairn.models;

import dev.cairn.models.result.FitResult;
import dev.cairn.samplers.Draws;

/**
 * A finished fit: the result (what result.json holds), every draw (derived quantities included), and
 * figures for plots that the result does not carry (replicated check statistics, retention curve bands).
 */
public record FitOutcome(FitResult result, Draws draws, Figures figures) {
    public FitOutcome(FitResult result, Draws draws) {
        this(result, draws, Figures.NONE);
    }
}
