package dev.cairn.samplers;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * The named coordinates of a target, each with the transform that takes it to the real line.
 * Immutable; build with {@link #builder()}.
 */
public final class Parameters {
    private final String[] names;
    private final Transform[] transforms;
    private final Map<String, Integer> index;

    private Parameters(List<String> names, List<Transform> transforms) {
        this.names = names.toArray(new String[0]);
        this.transforms = transforms.toArray(new Transform[0]);
        Map<String, Integer> map = new HashMap<>();
        for (int i = 0; i < this.names.length; i++) {
            map.put(this.names[i], i);
        }
        this.index = Collections.unmodifiableMap(map);
    }

    /** @return an empty builder */
    public static Builder builder() {
        return new Builder();
    }

    /**
     * Parameters that are all on the real line, in the order given.
     *
     * @param names the names, unique and non-blank
     * @return the parameters
     */
    public static Parameters real(String... names) {
        Builder b = builder();
        for (String n : names) {
            b.real(n);
        }
        return b.build();
    }

    /** @return how many coordinates */
    public int size() {
        return names.length;
    }

    /**
     * @param i a 0-based position
     * @return the name of the coordinate there
     */
    public String name(int i) {
        return names[i];
    }

    /** @return the names, in coordinate order */
    public List<String> names() {
        return List.of(names);
    }

    /**
     * @param i a 0-based position
     * @return the transform of the coordinate there
     */
    public Transform transform(int i) {
        return transforms[i];
    }

    /**
     * The position of a named coordinate.
     *
     * @param name the coordinate's name
     * @return its 0-based position
     * @throws IllegalArgumentException naming it when there is no such coordinate
     */
    public int indexOf(String name) {
        Integer i = index.get(name);
        if (i == null) {
            throw new IllegalArgumentException("no parameter named '" + name + "'; known: " + Arrays.toString(names));
        }
        return i;
    }

    /**
     * Writes the constrained values of the unconstrained point {@code u} into {@code out}.
     *
     * @param u   an unconstrained point
     * @param out receives the values on their natural scales (as long as u)
     */
    public void constrain(double[] u, double[] out) {
        for (int i = 0; i < names.length; i++) {
            out[i] = transforms[i].constrain(u[i]);
        }
    }

    /**
     * The unconstrained point of constrained values.
     *
     * @param x values on their natural scales, one per coordinate
     * @return the unconstrained point
     * @throws IllegalArgumentException for a wrong count or a value outside its transform's range
     */
    public double[] unconstrain(double[] x) {
        if (x.length != names.length) {
            throw new IllegalArgumentException("expected " + names.length + " values, was " + x.length);
        }
        double[] u = new double[x.length];
        for (int i = 0; i < x.length; i++) {
            if (!transforms[i].admits(x[i])) {
                throw new IllegalArgumentException(
                        "value of '" + names[i] + "' must lie in the range of " + transforms[i] + ", was " + x[i]);
            }
            u[i] = transforms[i].unconstrain(x[i]);
        }
        return u;
    }

    /**
     * Sum of the coordinates' log-Jacobians at the unconstrained point {@code u}.
     *
     * @param u an unconstrained point
     * @return the log-Jacobian of the map to the natural scales
     */
    public double logJacobian(double[] u) {
        double s = 0;
        for (int i = 0; i < names.length; i++) {
            s += transforms[i].logJacobian(u[i]);
        }
        return s;
    }

    /** Builds {@link Parameters}; names must be unique and non-blank. */
    public static final class Builder {
        private final List<String> names = new ArrayList<>();
        private final List<Transform> transforms = new ArrayList<>();

        private Builder() {
        }

        /**
         * Adds a coordinate.
         *
         * @param name      its name, unique and non-blank
         * @param transform the map from the real line to its natural scale
         * @return this builder
         */
        public Builder add(String name, Transform transform) {
            if (name == null || name.isBlank()) {
                throw new IllegalArgumentException("parameter name must be non-blank, was '" + name + "'");
            }
            if (names.contains(name)) {
                throw new IllegalArgumentException("parameter name '" + name + "' is used twice");
            }
            names.add(name);
            transforms.add(transform);
            return this;
        }

        /**
         * @param name a new coordinate on the real line
         * @return this builder
         */
        public Builder real(String name) {
            return add(name, Transform.REAL);
        }

        /**
         * @param name a new positive coordinate (sampled on the log scale)
         * @return this builder
         */
        public Builder positive(String name) {
            return add(name, Transform.POSITIVE);
        }

        /**
         * @param name a new coordinate in (0, 1) (sampled on the logit scale)
         * @return this builder
         */
        public Builder unitInterval(String name) {
            return add(name, Transform.UNIT_INTERVAL);
        }

        /**
         * Adds {@code name[1]} .. {@code name[n]}.
         *
         * @param name      the vector's name
         * @param n         its length
         * @param transform every element's transform
         * @return this builder
         */
        public Builder vector(String name, int n, Transform transform) {
            for (int i = 1; i <= n; i++) {
                add(name + "[" + i + "]", transform);
            }
            return this;
        }

        /**
         * @return the parameters
         * @throws IllegalArgumentException when none were added
         */
        public Parameters build() {
            if (names.isEmpty()) {
                throw new IllegalArgumentException("a target needs at least one parameter");
            }
            return new Parameters(names, transforms);
        }
    }
}
