package dev.cairn.models.data;

import dev.cairn.models.InputException;
import java.sql.SQLException;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/** Quoting for the embedded SQL engine, and its errors turned into one line a person can act on. */
final class Sql {
    private static final Pattern LINE = Pattern.compile("CSV Error on Line: (\\d+)");
    private static final Pattern CONVERT = Pattern.compile(
            "converting column \"([^\"]*)\"\\. Could not convert string \"([^\"]*)\" to '([A-Z]+)'");
    private static final Pattern COLUMNS = Pattern.compile("Expected Number of Columns: (\\d+) Found: (\\d+)");

    private Sql() {
    }

    static String identifier(String name) {
        return '"' + name.replace("\"", "\"\"") + '"';
    }

    static String literal(String text) {
        return "'" + text.replace("'", "''") + "'";
    }

    /** An engine error while reading {@code file}, as one line naming the file, line and column. */
    static InputException readError(String file, SQLException e) {
        String message = e.getMessage() == null ? e.toString() : e.getMessage();
        Matcher line = LINE.matcher(message);
        String where = line.find() ? file + ": line " + line.group(1) : file;
        Matcher convert = CONVERT.matcher(message);
        if (convert.find()) {
            String expected = switch (convert.group(3)) {
                case "DOUBLE" -> "a number";
                case "BIGINT" -> "a whole number";
                case "BOOLEAN" -> "true/false or 1/0";
                default -> "a " + convert.group(3).toLowerCase(java.util.Locale.ROOT);
            };
            return new InputException(where + ", column '" + convert.group(1) + "': expected " + expected
                    + ", found '" + convert.group(2) + "'");
        }
        Matcher columns = COLUMNS.matcher(message);
        if (columns.find()) {
            return new InputException(where + ": expected " + columns.group(1) + " cells as in the header, found "
                    + columns.group(2));
        }
        String first = message.lines().findFirst().orElse(message).trim();
        return new InputException(where + ": cannot be read: " + first);
    }
}
