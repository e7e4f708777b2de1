package dev.cairn.samplers;

/** A log density (up to a constant) at a point; -infinity outside the support. */
@FunctionalInterface
public interface LogDensity {
    double at(double[] point);
}
