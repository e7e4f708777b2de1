package dev.cairn.samplers;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.Reader;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import com.fasterxml.jackson.core.io.NumberOutput;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;

/**
 * The draws text format of the command-line contract: RFC 4180 CSV (Apache Commons CSV does the quoting
 * and parsing) with LF line ends, a header {@code chain,iteration,<name>...}, then one row per draw with
 * 1-based chain and iteration, rows grouped by chain. A name holding a comma, a quote or a line break is
 * quoted, so any arm or segment name survives the round trip. Values are written as the shortest decimal
 * that reads back to the identical double (Giulietti's Schubfach algorithm, 2020, as jackson-core ships
 * it; the same text as {@link Double#toString(double)} from Java 19 on, and two to three times faster
 * than Java 17's, which matters at millions of values).
 *
 * <p>Works on {@link Reader}/{@link Writer} only; opening files is the caller's business. {@link Rows}
 * reads row by row, for files too large to hold (see {@link DrawsFile}).
 */
public final class DrawsCsv {
    /** RFC 4180 with LF line ends; blanks around a cell are ignored on reading, blank lines skipped. */
    static final CSVFormat FORMAT = CSVFormat.RFC4180.builder()
            .setRecordSeparator('\n')
            .setIgnoreSurroundingSpaces(true)
            .setIgnoreEmptyLines(true)
            .get();

    private DrawsCsv() {
    }

    /** Thrown for malformed draws text; the message names the line and column. */
    public static final class FormatException extends RuntimeException {
        private final long line;

        public FormatException(long line, String message) {
            super(line > 0 ? "line " + line + ": " + message : message);
            this.line = line;
        }

        /** {@return 1-based line of the problem (the header is line 1), 0 when not tied to one line} */
        public long line() {
            return line;
        }
    }

    /**
     * Writes draws as text: the header, then one row per draw, chain by chain.
     *
     * @param draws the draws
     * @param out   where the text goes (flushed, not closed)
     * @throws UncheckedIOException when writing fails
     */
    public static void write(Draws draws, Writer out) {
        try {
            List<String> header = new ArrayList<>(draws.names().size() + 2);
            header.add("chain");
            header.add("iteration");
            header.addAll(draws.names());
            out.write(FORMAT.format(header.toArray()));
            out.write('\n');
            // Rows are formatted in parallel batches (formatting doubles is the cost) and written in order, so
            // the text is the same whatever the number of threads. Numbers never need quoting.
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

    /**
     * Writes draws as UTF-8 bytes, the same text as {@link #write(Draws, Writer)}: the header encoded from its
     * names, the rows (numbers only, so ASCII) built as bytes directly, which saves a character encoder's pass
     * over hundreds of megabytes in a large fit.
     *
     * @param draws the draws
     * @param out   where the bytes go (flushed, not closed)
     * @throws UncheckedIOException when writing fails
     */
    public static void write(Draws draws, java.io.OutputStream out) {
        try {
            List<String> header = new ArrayList<>(draws.names().size() + 2);
            header.add("chain");
            header.add("iteration");
            header.addAll(draws.names());
            out.write((FORMAT.format(header.toArray()) + "\n").getBytes(java.nio.charset.StandardCharsets.UTF_8));
            int rows = draws.chains() * draws.iterations();
            int batch = Math.max(1, Math.min(256, 2_000_000 / Math.max(1, draws.names().size())));
            for (int first = 0; first < rows; first += batch) {
                int from = first, to = Math.min(rows, first + batch);
                byte[][] bytes = java.util.stream.IntStream.range(from, to).parallel()
                        .mapToObj(r -> rowBytes(draws, r / draws.iterations(), r % draws.iterations()))
                        .toArray(byte[][]::new);
                for (byte[] line : bytes) {
                    out.write(line);
                }
            }
            out.flush();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    private static byte[] rowBytes(Draws draws, int chain, int iteration) {
        int k = draws.names().size();
        byte[] buffer = new byte[26 * (k + 2)];
        int at = ascii(Integer.toString(chain + 1), buffer, 0);
        buffer[at++] = ',';
        at = ascii(Integer.toString(iteration + 1), buffer, at);
        for (int j = 0; j < k; j++) {
            if (at + 26 > buffer.length) {
                buffer = java.util.Arrays.copyOf(buffer, buffer.length * 2);
            }
            buffer[at++] = ',';
            at = ascii(NumberOutput.toString(draws.value(chain, j, iteration), true), buffer, at);
        }
        if (at + 1 > buffer.length) {
            buffer = java.util.Arrays.copyOf(buffer, buffer.length + 1);
        }
        buffer[at++] = '\n';
        return java.util.Arrays.copyOf(buffer, at);
    }

    /** Copies an ASCII string (a number's text, at most 25 characters) into buffer at, returning the end. */
    private static int ascii(String text, byte[] buffer, int at) {
        for (int i = 0; i < text.length(); i++) {
            buffer[at++] = (byte) text.charAt(i);
        }
        return at;
    }

    private static String row(Draws draws, int chain, int iteration) {
        int k = draws.names().size();
        StringBuilder sb = new StringBuilder(24 * (k + 2));
        sb.append(chain + 1).append(',').append(iteration + 1);
        for (int j = 0; j < k; j++) {
            sb.append(',').append(NumberOutput.toString(draws.value(chain, j, iteration), true));
        }
        return sb.append('\n').toString();
    }

    /**
     * Reads draws into memory. Chains are taken in the order they first appear; every chain must have the
     * same number of rows and each chain's rows must be contiguous.
     *
     * @param in the draws text
     * @return the draws
     * @throws FormatException for malformed text, naming the line and column
     */
    public static Draws read(Reader in) {
        try (Rows rows = new Rows(in)) {
            int k = rows.names().size();
            List<List<double[]>> chains = new ArrayList<>();
            double[] row = new double[k];
            while (rows.next(row)) {
                if (rows.chainIndex() == chains.size()) {
                    chains.add(new ArrayList<>());
                }
                chains.get(rows.chainIndex()).add(row.clone());
            }
            int n = rows.drawsPerChain();
            double[][][] values = new double[chains.size()][k][n];
            for (int c = 0; c < chains.size(); c++) {
                for (int t = 0; t < n; t++) {
                    double[] r = chains.get(c).get(t);
                    for (int j = 0; j < k; j++) {
                        values[c][j][t] = r[j];
                    }
                }
            }
            return Draws.adopt(rows.names(), values);
        }
    }

    /**
     * Draws text read one row at a time, checked as it goes: the header's names, then per row the chain
     * it belongs to and its values. {@link #drawsPerChain()} at the end checks that the chains are equally
     * long. A UTF-8 byte order mark before the header is skipped.
     */
    public static final class Rows implements AutoCloseable {
        private final CSVParser parser;
        private final Iterator<CSVRecord> records;
        private final List<String> names;
        private final Map<String, Integer> chains = new LinkedHashMap<>();
        private final List<Long> counts = new ArrayList<>();
        private String current;
        private int chainIndex = -1;
        private long line = 1;

        public Rows(Reader in) {
            try {
                BufferedReader reader = in instanceof BufferedReader b ? b : new BufferedReader(in, 1 << 16);
                reader.mark(1);
                if (reader.read() != '\uFEFF') {
                    reader.reset();
                }
                parser = CSVParser.builder().setReader(reader).setFormat(FORMAT).get();
            } catch (IOException e) {
                throw new UncheckedIOException(e);
            }
            records = parser.iterator();
            CSVRecord header = record();
            if (header == null) {
                throw new FormatException(0, "empty file: expected a header 'chain,iteration,<parameter>...'");
            }
            names = names(header);
        }

        private static List<String> names(CSVRecord header) {
            int width = header.size();
            if (!header.get(0).equals("chain")) {
                throw new FormatException(1, "first column must be 'chain', was '" + header.get(0) + "'");
            }
            if (width < 2 || !header.get(1).equals("iteration")) {
                throw new FormatException(1, "second column must be 'iteration', was '"
                        + (width > 1 ? header.get(1) : "") + "'");
            }
            if (width < 3) {
                throw new FormatException(1, "no parameter columns after 'chain,iteration'");
            }
            List<String> names = new ArrayList<>(width - 2);
            java.util.Set<String> seen = new java.util.HashSet<>();
            for (int j = 2; j < width; j++) {
                String name = header.get(j);
                if (name.isEmpty()) {
                    throw new FormatException(1, "column " + (j + 1) + " has an empty name");
                }
                if (!seen.add(name)) {
                    throw new FormatException(1, "column '" + name + "' appears twice");
                }
                names.add(name);
            }
            return List.copyOf(names);
        }

        /** The next record, or null at the end; malformed quoting becomes a {@link FormatException}. */
        private CSVRecord record() {
            try {
                if (!records.hasNext()) {
                    return null;
                }
                CSVRecord r = records.next();
                line = parser.getCurrentLineNumber();
                return r;
            } catch (UncheckedIOException e) {
                if (e.getCause() instanceof java.nio.charset.CharacterCodingException) {
                    throw e;
                }
                throw new FormatException(parser.getCurrentLineNumber() + 1, "not valid CSV ("
                        + e.getCause().getMessage() + ")");
            }
        }

        /** {@return the parameter names, in column order} */
        public List<String> names() {
            return names;
        }

        /** {@return line of the row last read (1-based; the header is line 1)} */
        public long line() {
            return line;
        }

        /** {@return 0-based index of the chain of the row last read, in order of first appearance} */
        public int chainIndex() {
            return chainIndex;
        }

        /**
         * Reads the next row's values into {@code row}.
         *
         * @param row receives the row's values, one per parameter
         * @return false at the end of the text
         * @throws FormatException for a malformed row, naming its line
         */
        public boolean next(double[] row) {
            CSVRecord r = record();
            if (r == null) {
                return false;
            }
            int width = names.size() + 2;
            if (r.size() != width) {
                throw new FormatException(line, "expected " + width + " cells, found " + r.size());
            }
            String chain = r.get(0);
            if (chain.isEmpty()) {
                throw new FormatException(line, "column 'chain' is empty");
            }
            if (!chain.equals(current)) {
                if (chains.containsKey(chain)) {
                    throw new FormatException(line, "rows of chain " + chain + " are not contiguous");
                }
                chainIndex = chains.size();
                chains.put(chain, chainIndex);
                counts.add(0L);
                current = chain;
            }
            number(r.get(1), line, "iteration");
            for (int j = 0; j < names.size(); j++) {
                row[j] = number(r.get(j + 2), line, names.get(j));
            }
            counts.set(chainIndex, counts.get(chainIndex) + 1);
            return true;
        }

        /** {@return number of chains read} */
        public int chains() {
            return chains.size();
        }

        /** {@return rows per chain, once all rows are read: checks there are some and that every chain has as many} */
        public int drawsPerChain() {
            if (chains.isEmpty()) {
                throw new FormatException(0, "no draws after the header");
            }
            List<String> labels = new ArrayList<>(chains.keySet());
            long n = counts.get(0);
            for (int c = 1; c < counts.size(); c++) {
                if (counts.get(c) != n) {
                    throw new FormatException(0, "chains have unequal lengths: chain " + labels.get(0) + " has " + n
                            + " draws, chain " + labels.get(c) + " has " + counts.get(c));
                }
            }
            if (n > Integer.MAX_VALUE - 8) {
                throw new FormatException(0, "chain " + labels.get(0) + " has " + n + " draws, more than "
                        + (Integer.MAX_VALUE - 8) + " per chain can be held");
            }
            return (int) n;
        }

        @Override
        public void close() {
            try {
                parser.close();
            } catch (IOException e) {
                throw new UncheckedIOException(e);
            }
        }
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
