package dev.cairn.models;

import dev.cairn.models.result.Result;
import dev.cairn.samplers.Draws;

/** A finished fit: the result (what result.json holds) and every draw, derived quantities included. */
public record FitOutcome(Result result, Draws draws) {
}
