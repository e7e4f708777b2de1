package dev.cairn.cli;

/** Input a person must fix (spec, data or draws file): reported as one line, exit code 2, nothing written. */
final class BadInput extends RuntimeException {
    BadInput(String message) {
        super(message);
    }
}
