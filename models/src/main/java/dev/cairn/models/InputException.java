package dev.cairn.models;

/**
 * Input a person must fix: a spec, data or history file that is missing, malformed or inconsistent.
 * The message is one line that names the file and the field, row or column; nothing has been written.
 */
public final class InputException extends RuntimeException {
    public InputException(String message) {
        super(message);
    }

    public InputException(String message, Throwable cause) {
        super(message, cause);
    }
}
