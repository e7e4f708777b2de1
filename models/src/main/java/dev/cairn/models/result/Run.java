package dev.cairn.models.result;

import com.fasterxml.jackson.annotation.JsonInclude;

/** How the fit ran. {@code seconds} is the only field that differs between identical runs. */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record Run(String method, int chains, int warmup, int draws, int thin, long seed, double seconds,
                  String version, String parameterisation) {

    public Run(String method, int chains, int warmup, int draws, int thin, long seed, double seconds, String version) {
        this(method, chains, warmup, draws, thin, seed, seconds, version, null);
    }
}
