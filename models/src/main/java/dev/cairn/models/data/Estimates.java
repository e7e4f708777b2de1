package dev.cairn.models.data;

import java.util.List;

/**
 * Effects estimated elsewhere, each with its standard error (layout {@code estimates}: name, estimate, se),
 * in file order.
 */
public record Estimates(List<String> names, double[] estimate, double[] se, String source, String query) {
    public Estimates {
        names = List.copyOf(names);
        estimate = estimate.clone();
        se = se.clone();
    }

    /**
     * {@return the number of estimates}
     */
    public int size() {
        return names.size();
    }

    /**
     * Read with DuckDB from a CSV or Parquet file, or from inline rows in memory (no engine); bad rows are refused
     * with their place.
     *
     * @param data    the spec's data part
     * @param baseDir the folder relative paths resolve against
     * @return the estimates and their standard errors
     * @throws InputException one line naming the file, row or column
     */
    public static Estimates read(dev.cairn.models.spec.DataSpec data, java.nio.file.Path baseDir) {
        return EstimatesReader.read(data, baseDir);
    }
}
