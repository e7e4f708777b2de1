package dev.cairn.samplers;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.Reader;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * The draws text format of the command-line contract: a header {@code chain,iteration,<name>...}, then one
 * row per draw with 1-based chain and iteration, rows grouped by chain. Values are written with
 * {@link Double#toString(double)}, which reads back to the identical double.
 *
 * <p>Works on {@link Reader}/{@link Writer} only; opening files is the caller's business.
 */
public final class DrawsCsv {
    private DrawsCsv() {
    }

    /** Thrown for malformed draws text; the message names the line and column. */
    public static final class FormatException extends RuntimeException {
        private final long line;

        public FormatException(long line, String message) {
            super(line > 0 ? "line " + line + ": " + message : message);
            this.line = line;
        }

        /** 1-based line of the problem (the header is line 1), 0 when not tied to one line. */
        public long line() {
            return line;
        }
    }

    public static void write(Draws draws, Writer out) {
        try {
            StringBuilder sb = new StringBuilder(256);
            sb.append("chain,iteration");
            for (String n : draws.names()) {
                sb.append(',').append(n);
            }
            sb.append('\n');
            out.write(sb.toString());
            // Rows are formatted in parallel batches (formatting doubles is the cost) and written in order, so
            // the text is the same whatever the number of threads.
            int rows = draws.chains() * draws.iterations();
            int batch = Math.max(1, Math.min(256, 2_000_000 / Math.max(1, draws.names().size())));
            for (int first = 0; first < rows; first += batch) {
                int from = first, to = Math.min(rows, first + batch);
                String[] text = java.util.stream.IntStream.range(from, to).parallel()
                        .mapToObj(r -> row(draws, r / draws.iterations(), r % draws.iterations()))
                        .toArray(String[]::new);
                for (String line : text) {
                    out.write(line);
                }
            }
            out.flush();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    private static String row(Draws draws, int chain, int iteration) {
        int k = draws.names().size();
        StringBuilder sb = new StringBuilder(24 * (k + 2));
        sb.append(chain + 1).append(',').append(iteration + 1);
        for (int j = 0; j < k; j++) {
            sb.append(',').append(draws.value(chain, j, iteration));
        }
        return sb.append('\n').toString();
    }

    /**
     * Reads draws. Chains are taken in the order they first appear; every chain must have the same number
     * of rows and each chain's rows must be contiguous.
     */
    public static Draws read(Reader in) {
        BufferedReader reader = in instanceof BufferedReader b ? b : new BufferedReader(in);
        try {
            String header = reader.readLine();
            if (header == null || header.isBlank()) {
                throw new FormatException(0, "empty file: expected a header 'chain,iteration,<parameter>...'");
            }
            String[] columns = split(header);
            if (columns.length < 1 || !columns[0].equals("chain")) {
                throw new FormatException(1, "first column must be 'chain', was '" + (columns.length > 0 ? columns[0] : "") + "'");
            }
            if (columns.length < 2 || !columns[1].equals("iteration")) {
                throw new FormatException(1, "second column must be 'iteration', was '"
                        + (columns.length > 1 ? columns[1] : "") + "'");
            }
            if (columns.length < 3) {
                throw new FormatException(1, "no parameter columns after 'chain,iteration'");
            }
            List<String> names = new ArrayList<>();
            for (int j = 2; j < columns.length; j++) {
                if (columns[j].isEmpty()) {
                    throw new FormatException(1, "column " + (j + 1) + " has an empty name");
                }
                if (names.contains(columns[j])) {
                    throw new FormatException(1, "column '" + columns[j] + "' appears twice");
                }
                names.add(columns[j]);
            }
            int k = names.size();
            Map<String, List<double[]>> chains = new LinkedHashMap<>();
            String current = null;
            long lineNo = 1;
            String line;
            while ((line = reader.readLine()) != null) {
                lineNo++;
                if (line.isBlank()) {
                    continue;
                }
                String[] cells = split(line);
                if (cells.length != columns.length) {
                    throw new FormatException(lineNo, "expected " + columns.length + " cells, found " + cells.length);
                }
                String chain = cells[0];
                if (chain.isEmpty()) {
                    throw new FormatException(lineNo, "column 'chain' is empty");
                }
                if (!chain.equals(current)) {
                    if (chains.containsKey(chain)) {
                        throw new FormatException(lineNo, "rows of chain " + chain + " are not contiguous");
                    }
                    chains.put(chain, new ArrayList<>());
                    current = chain;
                }
                number(cells[1], lineNo, "iteration");
                double[] row = new double[k];
                for (int j = 0; j < k; j++) {
                    row[j] = number(cells[j + 2], lineNo, names.get(j));
                }
                chains.get(chain).add(row);
            }
            if (chains.isEmpty()) {
                throw new FormatException(0, "no draws after the header");
            }
            int n = -1;
            String first = null;
            for (Map.Entry<String, List<double[]>> e : chains.entrySet()) {
                if (n < 0) {
                    n = e.getValue().size();
                    first = e.getKey();
                } else if (e.getValue().size() != n) {
                    throw new FormatException(0, "chains have unequal lengths: chain " + first + " has " + n
                            + " draws, chain " + e.getKey() + " has " + e.getValue().size());
                }
            }
            double[][][] values = new double[chains.size()][k][n];
            int c = 0;
            for (List<double[]> rows : chains.values()) {
                for (int t = 0; t < n; t++) {
                    double[] row = rows.get(t);
                    for (int j = 0; j < k; j++) {
                        values[c][j][t] = row[j];
                    }
                }
                c++;
            }
            return Draws.adopt(names, values);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    private static String[] split(String line) {
        String[] cells = line.split(",", -1);
        for (int i = 0; i < cells.length; i++) {
            String s = cells[i].trim();
            if (s.length() >= 2 && s.charAt(0) == '"' && s.charAt(s.length() - 1) == '"') {
                s = s.substring(1, s.length() - 1);
            }
            cells[i] = s;
        }
        return cells;
    }

    private static double number(String cell, long line, String column) {
        try {
            double v = Double.parseDouble(cell);
            if (!Double.isFinite(v)) {
                throw new FormatException(line, "column '" + column + "' is not a finite number: '" + cell + "'");
            }
            return v;
        } catch (NumberFormatException e) {
            throw new FormatException(line, "column '" + column + "' is not a number: '" + cell + "'");
        }
    }
}
