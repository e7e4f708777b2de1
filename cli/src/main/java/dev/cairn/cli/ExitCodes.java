package dev.cairn.cli;

/** Exit codes of the command-line contract. */
final class ExitCodes {
    static final int OK = 0;
    static final int INTERNAL_ERROR = 1;
    static final int BAD_INPUT = 2;
    static final int NOT_CONVERGED = 3;

    private ExitCodes() {
    }
}
