package dev.cairn.models.result;

/**
 * The priors a fit used, as the result's {@code priors} block: each model's own record (its fields are the
 * block's keys), so a result never carries an untyped object.
 */
public interface PriorsUsed {
    /**
     * Fixed priors documented in the code rather than given in the spec (segmented-spend's hyperpriors).
     *
     * @param hyperpriors where they are documented, and the priors themselves
     */
    record Documented(String hyperpriors) implements PriorsUsed {
    }
}
