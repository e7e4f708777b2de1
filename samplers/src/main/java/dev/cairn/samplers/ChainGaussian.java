package dev.cairn.samplers;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/**
 * A standard normal sampler bound to the random stream of the chain that uses it, made once per stream:
 * updaters are handed their chain's stream on every update, and this keeps the sampler from being rebuilt
 * each time. Per chain, not thread-safe.
 */
public final class ChainGaussian {
    private UniformRandomProvider boundTo;
    private ZigguratSampler.NormalizedGaussian gaussian;

    /** A standard normal draw from {@code rng}'s stream. */
    public double sample(UniformRandomProvider rng) {
        if (rng != boundTo) {
            gaussian = ZigguratSampler.NormalizedGaussian.of(rng);
            boundTo = rng;
        }
        return gaussian.sample();
    }
}
