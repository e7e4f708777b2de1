package dev.cairn.cli;

import java.util.Locale;

/** Number formatting for terminal tables. */
final class Numbers {
    private Numbers() {
    }

    /** {@code digits} significant digits, plain notation for moderate magnitudes; "-" when undefined. */
    static String sig(double x, int digits) {
        if (Double.isNaN(x)) {
            return "-";
        }
        if (Double.isInfinite(x)) {
            return x > 0 ? "inf" : "-inf";
        }
        if (x == 0) {
            return "0";
        }
        double a = Math.abs(x);
        if (a >= 1e6 || a < 1e-4) {
            return String.format(Locale.ROOT, "%." + (digits - 1) + "e", x);
        }
        int decimals = Math.max(0, digits - 1 - (int) Math.floor(Math.log10(a)));
        return String.format(Locale.ROOT, "%." + decimals + "f", x);
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
