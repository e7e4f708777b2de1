package dev.cairn.cli;

import java.util.Locale;

/** Number formatting for terminal tables. */
final class Numbers {
    private Numbers() {
    }

    /** {@code digits} significant digits, plain notation for moderate magnitudes; "-" when undefined. */
    static String sig(double x, int digits) {
        return dev.cairn.models.result.Format.sig(x, digits);
    }

    /** Whole number with thousands separators; "-" when undefined. */
    static String count(double x) {
        if (Double.isNaN(x)) {
            return "-";
        }
        return String.format(Locale.ROOT, "%,.0f", x);
    }

    static String fixed(double x, int decimals) {
        if (Double.isNaN(x)) {
            return "-";
        }
        if (Double.isInfinite(x)) {
            return "inf";
        }
        return String.format(Locale.ROOT, "%." + decimals + "f", x);
    }
}
