package dev.cairn.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;

/** The bar shows one fraction of the whole run, which only grows, with more chains than threads. */
class ProgressBarTest {
    @Test
    void theShareOnlyGrowsWhenLaterChainsStart() {
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        ProgressBar bar = ProgressBar.immediate(new PrintStream(bytes, true, StandardCharsets.UTF_8), "fit");
        int chains = 4;
        long perChain = 2000, warmup = 1000;
        bar.start(chains, perChain);
        // two threads: chains 0 and 1 run to the end, then chains 2 and 3
        for (int pair = 0; pair < 2; pair++) {
            for (long t = 100; t <= perChain; t += 100) {
                for (int c = 2 * pair; c < 2 * pair + 2; c++) {
                    bar.report(c, t, perChain, t < warmup);
                }
            }
        }
        Matcher m = Pattern.compile("\\] +(\\d+)% (warmup|sampling)").matcher(bytes.toString(StandardCharsets.UTF_8));
        List<Integer> shares = new ArrayList<>();
        while (m.find()) {
            shares.add(Integer.parseInt(m.group(1)));
        }
        assertTrue(shares.size() > 30, "drawn " + shares.size() + " times");
        for (int i = 1; i < shares.size(); i++) {
            assertTrue(shares.get(i) >= shares.get(i - 1), "went back: " + shares);
        }
        assertEquals(100, shares.get(shares.size() - 1));
        assertTrue(shares.contains(50), "half done when the first two chains finish: " + shares);
    }
}
