package dev.cairn.models.data;

import java.math.BigInteger;

/**
 * Sums of the payers' log spend, squared log spend and spend that are the same to the last bit whatever adds
 * them — the embedded engine in one pass, a distributed engine in partitions added in any order: every term
 * is a whole number of quanta (log spend in units of 2^-32, its square in units of 2^-64, spend in units of
 * 2^-10), so the sums are exact integers (128 bits), and each is turned into a double once, correctly
 * rounded. The log is {@link StrictMath#log} (the same bits on every machine). A quantum of 2^-32 in log
 * spend is a relative change of 2e-10 in spend, far below any currency's smallest unit, and the rounding of
 * each term is unbiased.
 */
public final class ExactSums {
    /** Log-spend units per 1. */
    public static final double LOG_SCALE = 0x1p32;
    /** Spend units per currency unit. */
    public static final double SPEND_SCALE = 0x1p10;

    private ExactSums() {
    }

    /**
     * A payer's log spend in whole units of 2^-32.
     *
     * @param spend the spend, within the range the readers accept (1e-12 to 1e15)
     * @return round(ln(spend) x 2^32); at most 35 x 2^32 in size (its square needs 128 bits)
     */
    public static long logUnits(double spend) {
        return Math.round(StrictMath.log(spend) * LOG_SCALE);
    }

    /**
     * A spend in whole units of 2^-10.
     *
     * @param spend the spend, at most 1e15
     * @return round(spend x 2^10)
     */
    public static long spendUnits(double spend) {
        return Math.round(spend * SPEND_SCALE);
    }

    /** Adds whole numbers exactly, in 128-bit two's complement (far from overflowing for any data). */
    public static final class Total {
        private long hi, lo;

        /**
         * Adds a value.
         *
         * @param v the value
         */
        public void add(long v) {
            add(v >> 63, v);
        }

        /**
         * Adds a 128-bit value.
         *
         * @param vHi its high 64 bits
         * @param vLo its low 64 bits
         */
        public void add(long vHi, long vLo) {
            long r = lo + vLo;
            hi += vHi + (Long.compareUnsigned(r, lo) < 0 ? 1 : 0);
            lo = r;
        }

        /**
         * Adds a value's square.
         *
         * @param v the value
         */
        public void addSquare(long v) {
            add(Math.multiplyHigh(v, v), v * v);
        }

        /**
         * Adds another total.
         *
         * @param other the other total
         */
        public void add(Total other) {
            add(other.hi, other.lo);
        }

        /** {@return the exact total} */
        public BigInteger units() {
            return BigInteger.valueOf(hi).shiftLeft(64).add(new BigInteger(Long.toUnsignedString(lo)));
        }

        /**
         * The total in units of 1 / scale, as a double (correctly rounded; scale a power of two).
         *
         * @param scale units per 1
         * @return the value
         */
        public double value(double scale) {
            return ExactSums.value(units(), scale);
        }
    }

    /**
     * Whole units as a double: the integer correctly rounded, then scaled by a power of two (exact).
     *
     * @param units the total in units
     * @param scale units per 1, a power of two
     * @return the value
     */
    public static double value(BigInteger units, double scale) {
        return units.doubleValue() / scale;
    }

    /** The three sums of one cell's payers. */
    public static final class PayerSums {
        private final Total log = new Total(), squared = new Total(), spend = new Total();

        /**
         * Adds one payer.
         *
         * @param y the payer's spend, > 0
         */
        public void add(double y) {
            long l = logUnits(y);
            log.add(l);
            squared.addSquare(l);
            spend.add(spendUnits(y));
        }

        /** {@return sum of log spend} */
        public double logSum() {
            return log.value(LOG_SCALE);
        }

        /** {@return sum of squared log spend} */
        public double logSqSum() {
            return squared.value(LOG_SCALE * LOG_SCALE);
        }

        /** {@return sum of spend} */
        public double spendSum() {
            return spend.value(SPEND_SCALE);
        }
    }
}
