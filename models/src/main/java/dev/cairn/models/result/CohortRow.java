package dev.cairn.models.result;

import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.databind.JsonSerializable;
import com.fasterxml.jackson.databind.SerializerProvider;
import com.fasterxml.jackson.databind.jsontype.TypeSerializer;
import java.io.IOException;
import java.util.List;
import java.util.Map;

/**
 * One (cohort, arm) of a retention result. In result.json the day intervals stand beside the other keys,
 * in this order: cohort, arm, installs, lastObservedDay, d&lt;N&gt;..., projected, and alpha, beta for
 * survival curves (written by {@link #serialize}, so the layout is the contract's, not Jackson's).
 *
 * @param days      d&lt;N&gt; -&gt; interval, in the spec's day order
 * @param projected the d&lt;N&gt; beyond the cohort's last observed day
 * @param alpha     the shifted-beta-geometric alpha (survival curves; null otherwise)
 * @param beta      its beta (survival curves; null otherwise)
 */
public record CohortRow(String cohort, String arm, long installs, int lastObservedDay, Map<String, Interval> days,
                        List<String> projected, Interval alpha, Interval beta) implements JsonSerializable {
    public CohortRow {
        days = java.util.Collections.unmodifiableMap(new java.util.LinkedHashMap<>(days));
        projected = List.copyOf(projected);
    }

    /**
     * The interval of day {@code key} ("d7"), or null when the spec did not ask for that day.
     *
     * @param key the day's key
     * @return the interval, or null
     */
    public Interval day(String key) {
        return days.get(key);
    }

    @Override
    public void serialize(JsonGenerator g, SerializerProvider provider) throws IOException {
        g.writeStartObject();
        g.writeStringField("cohort", cohort);
        g.writeStringField("arm", arm);
        g.writeNumberField("installs", installs);
        g.writeNumberField("lastObservedDay", lastObservedDay);
        for (Map.Entry<String, Interval> e : days.entrySet()) {
            g.writeFieldName(e.getKey());
            provider.defaultSerializeValue(e.getValue(), g);
        }
        g.writeFieldName("projected");
        provider.defaultSerializeValue(projected, g);
        if (alpha != null) {
            g.writeFieldName("alpha");
            provider.defaultSerializeValue(alpha, g);
        }
        if (beta != null) {
            g.writeFieldName("beta");
            provider.defaultSerializeValue(beta, g);
        }
        g.writeEndObject();
    }

    @Override
    public void serializeWithType(JsonGenerator g, SerializerProvider provider, TypeSerializer type) throws IOException {
        serialize(g, provider);
    }
}
