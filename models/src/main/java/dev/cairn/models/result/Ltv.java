package dev.cairn.models.result;

import com.fasterxml.jackson.annotation.JsonAnyGetter;
import com.fasterxml.jackson.annotation.JsonIgnore;
import java.util.Map;

/**
 * LTV over a horizon per arm; in result.json {@code {"horizon": H, "<arm>": interval, ...}}.
 *
 * @param horizon the last day counted
 * @param arms    arm -&gt; interval of revenue per active day x (1 + sum of r(t), t = 1..H)
 */
public record Ltv(int horizon, @JsonIgnore Map<String, Interval> arms) {
    public Ltv {
        arms = java.util.Collections.unmodifiableMap(new java.util.LinkedHashMap<>(arms));
    }

    /** {@return the arms' intervals beside the horizon, as the contract writes them} */
    @JsonAnyGetter
    public Map<String, Interval> byArm() {
        return arms;
    }
}
