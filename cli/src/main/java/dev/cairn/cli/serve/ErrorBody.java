package dev.cairn.cli.serve;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.nio.charset.StandardCharsets;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * The service's error answers: {@code {"error": {"status": 400, "message": "...", "pointer": "/control"}}}.
 * The message is the one line the command line prints; the pointer is the JSON pointer that line names,
 * when it names one (bad data in a file are named by file, line and column instead); only a 400 has one.
 */
final class ErrorBody {
    private static final ObjectMapper JSON = new ObjectMapper();
    /** A JSON pointer at the start of the message or after ": " (the way cairn's messages place them). */
    private static final Pattern POINTER = Pattern.compile("(?:^|: )(/[A-Za-z0-9_$~./-]*[A-Za-z0-9_$~-]|/)(?=[:,]|$)");

    private ErrorBody() {
    }

    /**
     * @param status  the HTTP status
     * @param message one line saying what is wrong and where
     * @return the error answer's JSON
     */
    static byte[] of(int status, String message) {
        ObjectNode root = JSON.createObjectNode();
        ObjectNode error = root.putObject("error");
        error.put("status", status);
        error.put("message", message);
        String pointer = status == 400 ? pointer(message) : null; // other errors are not about the spec
        if (pointer != null) {
            error.put("pointer", pointer);
        }
        return (root.toString() + "\n").getBytes(StandardCharsets.UTF_8);
    }

    /**
     * @param message an error line
     * @return the first JSON pointer it names, or null
     */
    static String pointer(String message) {
        if (message == null) {
            return null;
        }
        Matcher m = POINTER.matcher(message);
        return m.find() ? m.group(1) : null;
    }
}
