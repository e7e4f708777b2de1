package dev.cairn.models;

import dev.cairn.models.result.FitResult;
import dev.cairn.samplers.Draws;

/** A finished fit: the result (what result.json holds) and every draw, derived quantities included. */
public record FitOutcome(FitResult result, Draws draws) {
}
