package dev.cairn.samplers;

import java.io.IOException;
import java.io.Reader;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.DoubleBuffer;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.List;

/**
 * Draws text too large to hold, read in one pass and then handed out a block of columns at a time.
 *
 * <p>Diagnostics need each parameter's draws whole (ranks run over all of them), but only one
 * parameter's at a time. {@link #read} parses the text once, checking it as {@link DrawsCsv#read} does,
 * and copies the values as binary doubles, row by row, into a spill file; {@link #columns} then reads the
 * spill file sequentially once per block, keeping only that block's columns. Memory is the block, not the
 * file: a 2 GB text of 25,000 parameters is read in blocks of whatever the caller can afford. The spill
 * file (8 bytes a value, about 40% of the text) is deleted on {@link #close()}.
 */
public final class DrawsFile implements AutoCloseable {
    private static final int BUFFER = 1 << 20;

    private final List<String> names;
    private final int chains;
    private final int draws;
    private final Path spill;

    private DrawsFile(List<String> names, int chains, int draws, Path spill) {
        this.names = names;
        this.chains = chains;
        this.draws = draws;
        this.spill = spill;
    }

    /** Consumer of one block of columns: names and, per name, draws[chain][iteration]. */
    public interface Block {
        void accept(List<String> names, List<double[][]> columns);
    }

    /**
     * Reads draws text, spilling the values into a new file in {@code spillFolder}.
     *
     * @param in          the draws text
     * @param spillFolder where the spill file is made (deleted on {@link #close()}, or when reading fails)
     * @return the file's draws, to be read by {@link #columns}
     * @throws DrawsCsv.FormatException for malformed text, naming the line
     * @throws IOException              when the spill file cannot be written
     */
    public static DrawsFile read(Reader in, Path spillFolder) throws IOException {
        Path spill = Files.createTempFile(spillFolder, "cairn-draws-", ".spill");
        spill.toFile().deleteOnExit();
        try (DrawsCsv.Rows rows = new DrawsCsv.Rows(in);
             FileChannel out = FileChannel.open(spill, StandardOpenOption.WRITE)) {
            int k = rows.names().size();
            double[] row = new double[k];
            ByteBuffer bytes = ByteBuffer.allocateDirect(Math.max(BUFFER, 8 * k)).order(ByteOrder.nativeOrder());
            while (rows.next(row)) {
                if (bytes.remaining() < 8 * k) {
                    drain(bytes, out);
                }
                bytes.asDoubleBuffer().put(row);
                bytes.position(bytes.position() + 8 * k);
            }
            drain(bytes, out);
            return new DrawsFile(rows.names(), rows.chains(), rows.drawsPerChain(), spill);
        } catch (RuntimeException | IOException e) {
            Files.deleteIfExists(spill);
            throw e;
        }
    }

    private static void drain(ByteBuffer bytes, FileChannel out) throws IOException {
        bytes.flip();
        while (bytes.hasRemaining()) {
            out.write(bytes);
        }
        bytes.clear();
    }

    /** @return the parameter names, in column order */
    public List<String> names() {
        return names;
    }

    /** @return how many chains */
    public int chains() {
        return chains;
    }

    /** @return draws per chain */
    public int draws() {
        return draws;
    }

    /** {@return bytes one parameter's draws take in memory} */
    public long bytesPerColumn() {
        return 8L * chains * draws;
    }

    /**
     * Hands out the columns in blocks of at most {@code perBlock}, in column order; each block's arrays
     * are new, so the consumer may keep or drop them.
     *
     * @param perBlock most columns in one block, at least 1
     * @param consumer takes each block
     * @throws java.io.UncheckedIOException when the spill file cannot be read back
     */
    public void columns(int perBlock, Block consumer) {
        if (perBlock < 1) {
            throw new IllegalArgumentException("perBlock must be >= 1, was " + perBlock);
        }
        int k = names.size();
        try (FileChannel in = FileChannel.open(spill, StandardOpenOption.READ)) {
            ByteBuffer bytes = ByteBuffer.allocateDirect(Math.max(BUFFER, 8 * k)).order(ByteOrder.nativeOrder());
            for (int first = 0; first < k; first += perBlock) {
                int width = Math.min(perBlock, k - first);
                double[][][] block = new double[width][chains][draws];
                in.position(0);
                bytes.clear().flip();
                for (int c = 0; c < chains; c++) {
                    for (int t = 0; t < draws; t++) {
                        if (bytes.remaining() < 8 * k) {
                            bytes.compact();
                            while (bytes.hasRemaining() && in.read(bytes) >= 0) {
                                // fill the buffer
                            }
                            bytes.flip();
                            if (bytes.remaining() < 8 * k) {
                                throw new IOException(spill + ": ended early (was it changed while read?)");
                            }
                        }
                        DoubleBuffer row = bytes.asDoubleBuffer();
                        for (int j = 0; j < width; j++) {
                            block[j][c][t] = row.get(first + j);
                        }
                        bytes.position(bytes.position() + 8 * k);
                    }
                }
                consumer.accept(names.subList(first, first + width), List.of(block));
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** Deletes the spill file. */
    @Override
    public void close() throws IOException {
        Files.deleteIfExists(spill);
    }
}
