package dev.cairn.cli;

import java.io.FilterWriter;
import java.io.IOException;
import java.io.Writer;

/**
 * A writer for text bound for a terminal: control characters in names that came from the user's data
 * (an arm called "A\u001b[2J" would clear the screen; BEL rings; a carriage return overwrites the line)
 * are written visibly as {@code \x1b}, {@code \x07}, {@code \x0d}. Line feeds and tabs pass, and so does
 * the platform's line separator; C1 controls (U+0080..U+009F) and DEL are escaped too.
 *
 * <p>Files cairn writes keep names as they are; only what is printed is escaped.
 */
public final class TerminalText extends FilterWriter {
    private static final boolean CRLF = System.lineSeparator().equals("\r\n");

    TerminalText(Writer out) {
        super(out);
    }

    /** The escaped form of {@code s}. */
    public static String escape(String s) {
        StringBuilder sb = null;
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            if (control(c)) {
                if (sb == null) {
                    sb = new StringBuilder(s.length() + 8).append(s, 0, i);
                }
                sb.append(c <= 0xFF ? String.format("\\x%02x", (int) c) : String.format("\\u%04x", (int) c));
            } else if (sb != null) {
                sb.append(c);
            }
        }
        return sb == null ? s : sb.toString();
    }

    private static boolean control(char c) {
        if (c == '\n' || c == '\t' || (c == '\r' && CRLF)) {
            return false;
        }
        return c < 0x20 || c == 0x7F || (c >= 0x80 && c <= 0x9F) || c == '\u2028' || c == '\u2029';
    }

    @Override
    public void write(int c) throws IOException {
        out.write(control((char) c) ? escape(String.valueOf((char) c)) : String.valueOf((char) c));
    }

    @Override
    public void write(char[] buf, int off, int len) throws IOException {
        out.write(escape(new String(buf, off, len)));
    }

    @Override
    public void write(String str, int off, int len) throws IOException {
        out.write(escape(str.substring(off, off + len)));
    }
}
