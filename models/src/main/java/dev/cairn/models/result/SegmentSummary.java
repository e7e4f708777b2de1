package dev.cairn.models.result;

import com.fasterxml.jackson.annotation.JsonInclude;
import java.util.List;
import java.util.Map;

/** One segment of a segmented-spend result: its users, per-arm summaries, comparisons and notes. */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record SegmentSummary(long users, Map<String, ArmSummary> arms, List<Comparison> comparisons,
                             List<String> notes) {
}
