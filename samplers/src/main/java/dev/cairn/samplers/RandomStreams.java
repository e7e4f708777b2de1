package dev.cairn.samplers;

import org.apache.commons.rng.JumpableUniformRandomProvider;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;

/**
 * Random streams for chains. Chain c's stream is the xoshiro256++ generator seeded from the run's seed
 * and advanced by c + 1 jumps of 2^128 steps, so streams never overlap and depend on (seed, c) alone,
 * not on which thread runs the chain or in what order.
 */
public final class RandomStreams {
    private RandomStreams() {
    }

    /**
     * Chain c's random stream: the run's generator advanced by c + 1 jumps of 2^128 steps.
     *
     * @param seed  the run's seed
     * @param chain the chain's index, from 0
     * @return the stream, the same for the same (seed, chain) on any thread
     * @throws IllegalArgumentException when chain is negative
     */
    public static UniformRandomProvider forChain(long seed, int chain) {
        if (chain < 0) {
            throw new IllegalArgumentException("chain index must be >= 0, was " + chain);
        }
        JumpableUniformRandomProvider master =
                (JumpableUniformRandomProvider) RandomSource.XO_SHI_RO_256_PP.create(seed);
        UniformRandomProvider stream = null;
        for (int i = 0; i <= chain; i++) {
            stream = master.jump();
        }
        return stream;
    }
}
