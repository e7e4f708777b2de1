package dev.cairn.cli.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;

class ChartsTest {
    private static final String LONG = "Store layout with a very long descriptive name that goes on";

    /** Long names are cut for the chart, control characters shown escaped, and the labels stay distinct. */
    @Test
    void labelsAreShortEscapedAndDistinct() {
        List<String> labels = Charts.labels(List.of(LONG + " A", LONG + " B", "short", "bell\u0007"));
        assertEquals("Store layout with a very lo…", labels.get(0));
        assertEquals("Store layout with a ver…#2", labels.get(1), "a cut name that repeats is numbered");
        assertEquals("short", labels.get(2));
        assertEquals("bell\\x07", labels.get(3));
        labels.forEach(l -> assertTrue(l.codePointCount(0, l.length()) <= Charts.LABEL, l));
    }

    /** A chart of arms with 200-character names keeps its labels and title short. */
    @Test
    void chartsOfLongNamesStayInside() {
        String name = "x".repeat(200);
        String svg = Charts.histograms("ARPU of " + name, "ARPU", List.of(name + "1", name + "2"),
                List.of(new double[] {1, 2, 3}, new double[] {2, 3, 4}), null);
        assertFalse(svg.contains("x".repeat(Charts.TITLE)), "no full name in the chart");
        assertTrue(svg.contains("x".repeat(Charts.LABEL - 1) + "…"), "the cut labels are there");
    }
}
