package dev.cairn.models.result;

import java.util.Map;

/**
 * One arm of a retention result, install-weighted over the cohorts.
 *
 * @param installs  installs over all cohorts
 * @param retention d&lt;N&gt; -&gt; interval of the share retained (or active) on day N
 */
public record RetentionArm(long installs, Map<String, Interval> retention) {
    public RetentionArm {
        retention = java.util.Collections.unmodifiableMap(new java.util.LinkedHashMap<>(retention));
    }
}
