package dev.cairn.models;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.util.Properties;

/** cairn's version, written into the jar at build time. */
public final class Version {
    private Version() {
    }

    private static final String VERSION = read();

    /**
     * {@return cairn's version, from the build}
     */
    public static String get() {
        return VERSION;
    }

    private static String read() {
        Properties p = new Properties();
        try (InputStream in = Version.class.getResourceAsStream("/dev/cairn/models/version.properties")) {
            if (in != null) {
                p.load(in);
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return p.getProperty("version", "unknown");
    }
}
