package dev.cairn.cli.serve;

import com.fasterxml.jackson.databind.JsonNode;
import dev.cairn.models.InputException;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.InvalidPathException;
import java.nio.file.Path;
import java.util.Iterator;
import java.util.Map;

/**
 * What files a request may make the service read: none, unless it was started with {@code --data-root DIR},
 * and then only files inside DIR once every symbolic link is resolved. Every file a spec names sits under a
 * key called {@code path} ({@code /data/path}, {@code /priors/fromHistory/path}, ...; a test keeps the schema
 * to that), so the check walks the spec for those keys, skipping the inline rows (data, not paths).
 */
final class DataAccess {
    private final Path root; // real path, or null: no files at all

    private DataAccess(Path root) {
        this.root = root;
    }

    /**
     * @param dataRoot the folder files may be read from, or null for none
     * @return the policy
     * @throws IllegalArgumentException when the folder does not exist
     */
    static DataAccess of(Path dataRoot) {
        if (dataRoot == null) {
            return new DataAccess(null);
        }
        try {
            Path real = dataRoot.toRealPath();
            if (!Files.isDirectory(real)) {
                throw new IllegalArgumentException("--data-root " + dataRoot + ": is not a folder");
            }
            return new DataAccess(real);
        } catch (IOException e) {
            throw new IllegalArgumentException("--data-root " + dataRoot + ": no such folder");
        }
    }

    /** {@return the folder relative paths resolve against (the data root; with none, paths are refused anyway)} */
    Path base() {
        return root != null ? root : Path.of("").toAbsolutePath();
    }

    /**
     * Refuses a spec that names a file the service may not read.
     *
     * @param spec the spec's JSON
     * @throws InputException naming the key's JSON pointer
     */
    void check(JsonNode spec) {
        walk(spec, "");
    }

    private void walk(JsonNode node, String pointer) {
        if (node == null || !node.isObject()) {
            return;
        }
        for (Iterator<Map.Entry<String, JsonNode>> it = node.fields(); it.hasNext(); ) {
            Map.Entry<String, JsonNode> e = it.next();
            String child = pointer + "/" + e.getKey().replace("~", "~0").replace("/", "~1");
            if (child.equals("/data/rows")) {
                continue;
            }
            if (e.getKey().equals("path") && e.getValue().isTextual()) {
                allow(e.getValue().asText(), child);
            } else {
                walk(e.getValue(), child);
            }
        }
    }

    private void allow(String written, String pointer) {
        if (root == null) {
            throw new InputException(pointer + ": this service reads no files; send the data inline (data.rows), "
                    + "or start it with --data-root DIR to allow files inside DIR");
        }
        Path resolved;
        try {
            resolved = root.resolve(written).normalize();
        } catch (InvalidPathException e) {
            throw new InputException(pointer + ": '" + written + "' is not a valid path");
        }
        if (!resolved.startsWith(root)) {
            throw new InputException(pointer + ": '" + written + "' is outside this service's data folder");
        }
        Path real;
        try {
            real = resolved.toRealPath();
        } catch (IOException e) { // said without the server's own folders
            throw new InputException(pointer + ": " + written + ": no such file in this service's data folder");
        }
        if (!real.startsWith(root)) {
            throw new InputException(pointer + ": '" + written + "' links outside this service's data folder");
        }
    }
}
