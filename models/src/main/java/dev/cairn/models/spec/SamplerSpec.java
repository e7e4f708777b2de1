package dev.cairn.models.spec;

import com.fasterxml.jackson.annotation.JsonInclude;

/**
 * Sampler settings. Defaults: method auto (exact when the model and priors are conjugate, slice
 * otherwise), 4 chains, 1,000 warmup and 1,000 kept draws per chain, thinning 1, seed 1, one thread per
 * chain up to the number of processors.
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record SamplerSpec(String method, Integer chains, Integer warmup, Integer draws, Integer thin, Long seed,
                          Integer threads) {
    public static final SamplerSpec DEFAULT = new SamplerSpec("auto", 4, 1000, 1000, 1, 1L, null);

    /**
     * {@return the same block with the defaults filled in where it gives nothing}
     */
    public SamplerSpec withDefaults() {
        return new SamplerSpec(method == null ? DEFAULT.method : method,
                chains == null ? DEFAULT.chains : chains,
                warmup == null ? DEFAULT.warmup : warmup,
                draws == null ? DEFAULT.draws : draws,
                thin == null ? DEFAULT.thin : thin,
                seed == null ? DEFAULT.seed : seed,
                threads);
    }
}
