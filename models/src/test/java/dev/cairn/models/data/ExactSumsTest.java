package dev.cairn.models.data;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.math.BigInteger;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** Exact sums: the same bits in any order and any split into parts, equal to a BigInteger reference. */
class ExactSumsTest {
    @Test
    void anyOrderAndAnySplitGiveTheSameBits() {
        SplittableRandom rng = new SplittableRandom(3);
        List<Double> spend = new ArrayList<>();
        for (int i = 0; i < 20_000; i++) {
            spend.add(Math.exp(1 + 2 * rng.nextGaussian()));
        }
        spend.add(1e15);
        spend.add(1e-12);
        ExactSums.PayerSums inOrder = new ExactSums.PayerSums();
        spend.forEach(inOrder::add);
        BigInteger log = BigInteger.ZERO, square = BigInteger.ZERO;
        for (double y : spend) {
            BigInteger l = BigInteger.valueOf(ExactSums.logUnits(y));
            log = log.add(l);
            square = square.add(l.multiply(l));
        }
        assertEquals(ExactSums.value(log, ExactSums.LOG_SCALE), inOrder.logSum(), 0);
        assertEquals(ExactSums.value(square, ExactSums.LOG_SCALE * ExactSums.LOG_SCALE), inOrder.logSqSum(), 0);
        for (int round = 0; round < 5; round++) {
            Collections.shuffle(spend, new java.util.Random(round));
            // parts added in a shuffled order, as partitions of a distributed engine would be
            ExactSums.Total[] parts = new ExactSums.Total[7];
            ExactSums.Total[] squares = new ExactSums.Total[7];
            for (int p = 0; p < parts.length; p++) {
                parts[p] = new ExactSums.Total();
                squares[p] = new ExactSums.Total();
            }
            for (int i = 0; i < spend.size(); i++) {
                long l = ExactSums.logUnits(spend.get(i));
                parts[i % 7].add(l);
                squares[i % 7].addSquare(l);
            }
            ExactSums.Total total = new ExactSums.Total(), totalSq = new ExactSums.Total();
            for (int p = parts.length - 1; p >= 0; p--) {
                total.add(parts[p]);
                totalSq.add(squares[p]);
            }
            assertEquals(inOrder.logSum(), total.value(ExactSums.LOG_SCALE), 0);
            assertEquals(inOrder.logSqSum(), totalSq.value(ExactSums.LOG_SCALE * ExactSums.LOG_SCALE), 0);
        }
    }

    @Test
    void carriesPastSixtyFourBits() {
        ExactSums.Total t = new ExactSums.Total();
        BigInteger reference = BigInteger.ZERO;
        long big = ExactSums.logUnits(1e15);
        for (int i = 0; i < 1000; i++) {
            t.addSquare(big);
            t.add(-big);
            reference = reference.add(BigInteger.valueOf(big).pow(2)).subtract(BigInteger.valueOf(big));
        }
        assertEquals(reference, t.units());
        assertEquals(Math.log(1e15), ExactSums.logUnits(1e15) / ExactSums.LOG_SCALE, 1.2e-10);
    }
}
