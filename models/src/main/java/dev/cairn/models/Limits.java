package dev.cairn.models;

import java.util.Collection;

/**
 * The sizes cairn fits, each refused beyond with its limit in the message (exit code 2). They sit well
 * above any experiment's shape — a thousand arms, thousands of segments, years of daily cohorts — and
 * below what would run out of memory or time on a laptop; within them the cost grows near-linearly (the
 * README shows it). A value past one is almost always a mapping mistake, such as a user id read as the
 * arm.
 */
public final class Limits {
    /** Arms of one experiment. */
    public static final int ARMS = 1_000;
    /** Segments of a segmented fit. */
    public static final int SEGMENTS = 5_000;
    /** Segment x arm cells of a segmented fit. */
    public static final int CELLS = 25_000;
    /** Install cohorts of a retention fit. */
    public static final int COHORTS = 1_000;
    /** Largest day since install in a retention table. */
    public static final int DAY = 3_650;
    /** Effects pooled by pooled-effects. */
    public static final int ESTIMATES = 10_000;
    /** Characters of an arm, segment, cohort or effect name. */
    public static final int NAME_LENGTH = 200;
    /** Rows given inline in a spec ({@code data.rows}); more belong in a file. */
    public static final int INLINE_ROWS = 100_000;
    /** Bytes of a spec file. */
    public static final long SPEC_BYTES = 64L << 20;

    private Limits() {
    }

    /**
     * Refuses more than {@code limit} distinct names of a kind, or a name longer than {@link #NAME_LENGTH}.
     *
     * @param source what the names were read from, for the message
     * @param kind   "arm", "segment", "cohort" or "estimate"
     * @param names  the distinct names read
     * @param limit  the most that cairn fits
     * @param column the column they came from (null for none), for the hint
     * @throws InputException naming the count or the long name
     */
    public static void names(String source, String kind, Collection<String> names, int limit, String column) {
        if (names.size() > limit) {
            throw new InputException(String.format(java.util.Locale.ROOT, "%s: %,d %ss, more than the %,d cairn fits%s",
                    source, names.size(), kind, limit, column == null ? "" : " (is '" + column + "' the " + kind + " column?)"));
        }
        for (String name : names) {
            if (name != null && name.codePointCount(0, name.length()) > NAME_LENGTH) {
                throw new InputException(source + ": the " + kind + " name '" + name.substring(0, 40) + "…' has "
                        + name.codePointCount(0, name.length()) + " characters; names are limited to " + NAME_LENGTH);
            }
        }
    }
}
