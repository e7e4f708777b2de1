package dev.cairn.samplers;

import java.util.List;

/**
 * What a run keeps of each kept draw. By default every coordinate on its natural scale
 * ({@link #coordinates}); a model may keep quantities computed from the point instead, so that thousands of
 * internal coordinates need not be held once their named quantities are known.
 */
public interface Recording {
    /** {@return the names of the kept values, in the order {@link Recorder#record} writes them} */
    List<String> names();

    /**
     * A recorder for one chain (it may keep scratch space; one chain uses it from one thread at a time).
     *
     * @return the recorder
     */
    Recorder start();

    /** The per-chain half of a recording. */
    interface Recorder {
        /**
         * @param point the chain's unconstrained point (not modified)
         * @param out   the kept values, in the order of {@link Recording#names()} (modified)
         */
        void record(double[] point, double[] out);
    }

    /**
     * Every coordinate on its natural scale.
     *
     * @param parameters the target's coordinates
     * @return the recording
     */
    static Recording coordinates(Parameters parameters) {
        return new Recording() {
            @Override
            public List<String> names() {
                return parameters.names();
            }

            @Override
            public Recorder start() {
                return parameters::constrain;
            }
        };
    }
}
