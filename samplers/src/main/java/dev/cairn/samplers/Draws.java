package dev.cairn.samplers;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * Posterior draws: chains x iterations x named columns (parameters on their natural scale, then derived
 * quantities). Immutable; accessors return copies.
 */
public final class Draws {
    private final List<String> names;
    private final Map<String, Integer> index;
    /** values[chain][column][iteration]. */
    private final double[][][] values;
    private final int iterations;

    private Draws(List<String> names, double[][][] values) {
        this.names = List.copyOf(names);
        this.values = values;
        this.iterations = values[0][0].length;
        this.index = new HashMap<>();
        for (int i = 0; i < names.size(); i++) {
            if (index.put(names.get(i), i) != null) {
                throw new IllegalArgumentException("column '" + names.get(i) + "' appears twice");
            }
        }
    }

    /**
     * Draws from arrays laid out as values[chain][column][iteration]; the arrays are copied.
     * Every chain must have the same number of iterations, at least one.
     *
     * @param names  the column names, distinct, in column order
     * @param values values[chain][column][iteration]
     * @return the draws
     * @throws IllegalArgumentException when there is no column, chain or iteration, a name repeats, or the
     *                                  chains differ in length
     */
    public static Draws of(List<String> names, double[][][] values) {
        if (names.isEmpty()) {
            throw new IllegalArgumentException("draws need at least one column");
        }
        if (values.length == 0) {
            throw new IllegalArgumentException("draws need at least one chain");
        }
        int n = -1;
        double[][][] copy = new double[values.length][][];
        for (int c = 0; c < values.length; c++) {
            if (values[c].length != names.size()) {
                throw new IllegalArgumentException("chain " + (c + 1) + " has " + values[c].length
                        + " columns, expected " + names.size());
            }
            copy[c] = new double[names.size()][];
            for (int j = 0; j < names.size(); j++) {
                if (n < 0) {
                    n = values[c][j].length;
                }
                if (values[c][j].length != n) {
                    throw new IllegalArgumentException("chain " + (c + 1) + " has " + values[c][j].length
                            + " iterations of '" + names.get(j) + "', expected " + n);
                }
                copy[c][j] = values[c][j].clone();
            }
        }
        if (n < 1) {
            throw new IllegalArgumentException("draws need at least one iteration");
        }
        return new Draws(names, copy);
    }

    /** Wraps arrays the caller hands over and will not touch again. */
    static Draws adopt(List<String> names, double[][][] values) {
        return new Draws(names, values);
    }

    /**
     * Draws that take over the caller's arrays without copying them (for large derived draws); the caller
     * must not change them afterwards. Same checks as {@link #of}.
     *
     * @param names  column names, unique
     * @param values values[chain][column][iteration], handed over
     * @return the draws
     * @throws IllegalArgumentException when the shapes disagree
     */
    public static Draws handOver(List<String> names, double[][][] values) {
        if (names.isEmpty() || values.length == 0) {
            throw new IllegalArgumentException("draws need at least one column and one chain");
        }
        int n = values[0].length == 0 ? 0 : values[0][0].length;
        for (int c = 0; c < values.length; c++) {
            if (values[c].length != names.size()) {
                throw new IllegalArgumentException("chain " + (c + 1) + " has " + values[c].length
                        + " columns, expected " + names.size());
            }
            for (int j = 0; j < names.size(); j++) {
                if (values[c][j].length != n) {
                    throw new IllegalArgumentException("chain " + (c + 1) + " has " + values[c][j].length
                            + " iterations of '" + names.get(j) + "', expected " + n);
                }
            }
        }
        if (n < 1) {
            throw new IllegalArgumentException("draws need at least one iteration");
        }
        return new Draws(names, values);
    }

    /** @return the column names, in column order */
    public List<String> names() {
        return names;
    }

    /** @return how many chains */
    public int chains() {
        return values.length;
    }

    /** @return draws per chain */
    public int iterations() {
        return iterations;
    }

    /**
     * @param name a column name
     * @return whether there is a column of that name
     */
    public boolean has(String name) {
        return index.containsKey(name);
    }

    /**
     * The draws of one column as [chain][iteration] (a copy).
     *
     * @param name the column
     * @return its draws per chain
     * @throws IllegalArgumentException when there is no such column
     */
    public double[][] column(String name) {
        int j = indexOf(name);
        double[][] out = new double[values.length][];
        for (int c = 0; c < values.length; c++) {
            out[c] = values[c][j].clone();
        }
        return out;
    }

    /**
     * All draws of one column, chains one after the other (a copy).
     *
     * @param name the column
     * @return its draws, chain 1 first
     * @throws IllegalArgumentException when there is no such column
     */
    public double[] pooled(String name) {
        int j = indexOf(name);
        double[] out = new double[values.length * iterations];
        for (int c = 0; c < values.length; c++) {
            System.arraycopy(values[c][j], 0, out, c * iterations, iterations);
        }
        return out;
    }

    /**
     * One draw of one column.
     *
     * @param chain     0-based chain
     * @param iteration 0-based iteration within the chain
     * @param name      the column
     * @return the value
     */
    public double value(int chain, int iteration, String name) {
        return values[chain][indexOf(name)][iteration];
    }

    double value(int chain, int column, int iteration) {
        return values[chain][column][iteration];
    }

    /** A quantity computed from one draw's values, in the order of {@link #names()}. */
    @FunctionalInterface
    public interface Derived {
        double of(double[] draw);
    }

    /**
     * These draws plus a column computed draw by draw.
     *
     * @param name the new column's name, not yet used
     * @param f    the quantity, from one draw's values in column order
     * @return new draws with the column added last
     */
    public Draws withDerived(String name, Derived f) {
        return withDerived(List.of(name), List.of(f));
    }

    /**
     * These draws plus several columns computed draw by draw, in one pass: each draw's values are gathered
     * once for all of them, so adding d columns to k costs (k + d) per draw, not d times k.
     *
     * @param added the new columns' names, distinct and not yet used
     * @param fs    their quantities, as many as names, each from one draw's values in column order
     * @return new draws with the columns added last, in the order given
     */
    public Draws withDerived(List<String> added, List<Derived> fs) {
        if (added.size() != fs.size()) {
            throw new IllegalArgumentException(added.size() + " names for " + fs.size() + " derived quantities");
        }
        java.util.Set<String> fresh = new java.util.HashSet<>();
        for (String name : added) {
            if (index.containsKey(name) || !fresh.add(name)) {
                throw new IllegalArgumentException("column '" + name + "' exists already");
            }
        }
        int k = names.size(), d = added.size();
        double[] row = new double[k];
        double[][][] out = new double[values.length][][];
        for (int c = 0; c < values.length; c++) {
            out[c] = Arrays.copyOf(values[c], k + d);
            for (int i = 0; i < d; i++) {
                out[c][k + i] = new double[iterations];
            }
            for (int t = 0; t < iterations; t++) {
                for (int j = 0; j < k; j++) {
                    row[j] = values[c][j][t];
                }
                for (int i = 0; i < d; i++) {
                    out[c][k + i][t] = fs.get(i).of(row);
                }
            }
        }
        List<String> newNames = new ArrayList<>(names);
        newNames.addAll(added);
        return new Draws(newNames, out);
    }

    /**
     * Only the named columns, in the order given (the arrays are shared, not copied).
     *
     * @param columns the columns to keep
     * @return the selected draws
     */
    public Draws select(List<String> columns) {
        double[][][] out = new double[values.length][columns.size()][];
        for (int j = 0; j < columns.size(); j++) {
            int src = indexOf(columns.get(j));
            for (int c = 0; c < values.length; c++) {
                out[c][j] = values[c][src];
            }
        }
        return new Draws(columns, out);
    }

    private int indexOf(String name) {
        Integer j = index.get(name);
        if (j == null) {
            throw new IllegalArgumentException("no column named '" + name + "'; columns: " + names);
        }
        return j;
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof Draws d && names.equals(d.names) && Arrays.deepEquals(values, d.values);
    }

    @Override
    public int hashCode() {
        return names.hashCode() * 31 + Arrays.deepHashCode(values);
    }

    @Override
    public String toString() {
        return "Draws[" + chains() + " chains x " + iterations + " iterations, columns " + names + "]";
    }
}
