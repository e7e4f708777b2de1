package dev.cairn.models.data;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeSet;

/**
 * Spend sufficient statistics per (segment, arm) cell, sorted by segment then arm. A segment may lack an
 * arm (no cell); the segmented model then estimates that cell from the pooling alone.
 */
public record SegmentedSpendData(List<Cell> cells, boolean hasSpend, String source, long rows, List<String> warnings,
                                 String query) {

    public record Cell(String segment, ArmStats stats) {
    }

    public SegmentedSpendData {
        cells = List.copyOf(cells);
        warnings = List.copyOf(warnings);
    }

    /**
     * {@return the segments, sorted}
     */
    public List<String> segments() {
        return new ArrayList<>(new TreeSet<>(cells.stream().map(Cell::segment).toList()));
    }

    /**
     * {@return the arms, sorted}
     */
    public List<String> arms() {
        return new ArrayList<>(new TreeSet<>(cells.stream().map(c -> c.stats().arm()).toList()));
    }

    /**
     * The cell's statistics, or null when the segment has no users in that arm.
     *
     * @param segment the segment
     * @param arm     the arm
     * @return the statistics, or null
     */
    public ArmStats cell(String segment, String arm) {
        for (Cell c : cells) {
            if (c.segment().equals(segment) && c.stats().arm().equals(arm)) {
                return c.stats();
            }
        }
        return null;
    }

    /** {@return statistics summed over segments, per arm (for the overall counts)} */
    public Map<String, long[]> armTotals() {
        Map<String, long[]> out = new LinkedHashMap<>();
        for (String a : arms()) {
            out.put(a, new long[2]);
        }
        for (Cell c : cells) {
            long[] t = out.get(c.stats().arm());
            t[0] += c.stats().users();
            t[1] += c.stats().payers();
        }
        return out;
    }
}
