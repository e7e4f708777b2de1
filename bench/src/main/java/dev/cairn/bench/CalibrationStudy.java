package dev.cairn.bench;

import dev.cairn.models.FitOptions;
import dev.cairn.models.Fitted;
import dev.cairn.models.plan.ArmTruth;
import dev.cairn.models.plan.DailyStats;
import dev.cairn.models.result.Comparison;
import dev.cairn.models.result.Result;
import dev.cairn.models.spec.Spec;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.apache.commons.math3.distribution.TDistribution;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.apache.commons.rng.simple.RandomSource;

/**
 * How often cairn's 95% intervals cover the truth on heavy-tailed revenue, beside what an analyst would do
 * otherwise, and what each costs.
 *
 * <p>Each simulated experiment has two arms of n users each (n = 10^4, 10^5 or 10^6 by class); a payer
 * rate drawn uniformly from 1-5% and a log-spend sd from 1.0-2.0 (log-spend mean 1.0); arm B's spend per
 * payer is A's times 1.05, so the true ARPU lift is +5% and the true difference in means is 0.05 x ARPU_A
 * under every spend law. Spend per payer is lognormal (the model holds), or — to see what happens when it
 * does not — a Pareto law with tail index 2.5 (finite mean, infinite variance; scaled to the lognormal's
 * mean) or "whales", a mixture of the lognormal (97%) and the same shifted up by e^3 (3%).
 *
 * <p>Methods, each at 95%: cairn (the spend model from the arms' sufficient statistics, exact conjugate
 * posterior with the default priors, 4 x 1,000 draws): the ARPU-lift interval and the difference interval;
 * the Welch t interval of the difference in means (Welch-Satterthwaite degrees of freedom); the percentile
 * bootstrap of the difference in means with 1,000 resamples. The bootstrap resamples users; since every
 * non-payer spends 0 it is drawn as the resample's number of payers, Binomial(n, m / n), and that many payers
 * drawn with replacement — the same law as resampling n users, at a cost of O(payers). The textbook
 * bootstrap over all n users is timed separately on a few experiments per class. Times are per analysis,
 * data in memory, warm.
 *
 * <p>Run: {@code java -cp bench/target/benchmarks.jar dev.cairn.bench.CalibrationStudy [experiments per
 * lognormal class] [per non-lognormal class] [more lognormal per class, cairn and Welch only]} (defaults 334,
 * 100 and 2,000: 1,002 lognormal experiments with every method, then 6,000 without the bootstrap).
 */
public final class CalibrationStudy {
    static final double LIFT = 0.05;
    static final double LOG_MEAN = 1.0;
    static final int RESAMPLES = 1000;

    private CalibrationStudy() {
    }

    /** A spend law per payer. */
    enum Law {
        LOGNORMAL, PARETO, WHALES;

        /** One payer's spend given the log-spend sd. */
        double draw(UniformRandomProvider rng, ZigguratSampler.NormalizedGaussian normal, double sd) {
            switch (this) {
                case LOGNORMAL:
                    return Math.exp(LOG_MEAN + sd * normal.sample());
                case PARETO: {
                    double alpha = 2.5;
                    double scale = mean(sd) * (alpha - 1) / alpha;
                    return scale * Math.pow(1 - rng.nextDouble(), -1 / alpha);
                }
                default: {
                    double shift = rng.nextDouble() < 0.03 ? 3 : 0;
                    return Math.exp(LOG_MEAN + shift + sd * normal.sample());
                }
            }
        }

        /** The mean spend per payer. */
        double mean(double sd) {
            double lognormal = Math.exp(LOG_MEAN + 0.5 * sd * sd);
            return this == WHALES ? lognormal * (0.97 + 0.03 * Math.exp(3)) : lognormal;
        }
    }

    /** One class of experiments. */
    record Setting(Law law, int users) {
    }

    /** One experiment's outcome: coverage of each method and times in seconds. */
    record Outcome(Setting setting, double payers, boolean cairnLift, boolean cairnDifference, boolean welch,
                   boolean bootstrap, double cairnSeconds, double welchSeconds, double bootstrapSeconds) {
    }

    /** One arm's data: its users and its payers' spend (the rest spend 0). */
    record Arm(long users, double[] spend) {
        double sum() {
            double s = 0;
            for (double y : spend) {
                s += y;
            }
            return s;
        }
    }

    static Arm arm(UniformRandomProvider rng, int users, double payerRate, double sd, Law law, double factor) {
        double[] day = new double[4];
        DailyStats.of(new ArmTruth(users, payerRate, 0, 1)).start(rng).next(day);
        int m = (int) day[1];
        ZigguratSampler.NormalizedGaussian normal = ZigguratSampler.NormalizedGaussian.of(rng);
        double[] spend = new double[m];
        for (int i = 0; i < m; i++) {
            spend[i] = factor * law.draw(rng, normal, sd);
        }
        return new Arm(users, spend);
    }

    /** cairn: the spend model on the arms' sufficient statistics (log spend summed in increasing order). */
    static Comparison cairn(Arm a, Arm b, long seed) {
        dev.cairn.models.spec.SpecBuilder spec = Spec.builder("spend").control("A").sampler(4, 1000, seed);
        for (String name : new String[] {"A", "B"}) {
            Arm arm = name.equals("A") ? a : b;
            double[] sorted = arm.spend().clone();
            Arrays.sort(sorted);
            double s1 = 0, s2 = 0;
            for (double y : sorted) {
                double l = Math.log(y);
                s1 += l;
                s2 += l * l;
            }
            spec.summaryRow(name, arm.users(), sorted.length, s1, s2);
        }
        Result r = Fitted.revenue(spec.build(), Path.of("."), FitOptions.DEFAULT.withThreads(1)).result();
        return r.comparisons().stream().filter(c -> c.metric().equals("arpu")).findFirst().orElseThrow();
    }

    /** The Welch t interval of mean(B) - mean(A), per-user spend with the zeros. */
    static double[] welch(Arm a, Arm b, double level) {
        double[] ma = moments(a), mb = moments(b);
        double va = ma[1] / a.users(), vb = mb[1] / b.users();
        double df = (va + vb) * (va + vb) / (va * va / (a.users() - 1) + vb * vb / (b.users() - 1));
        double t = new TDistribution(null, df).inverseCumulativeProbability(0.5 + level / 2);
        double d = mb[0] - ma[0];
        return new double[] {d - t * Math.sqrt(va + vb), d + t * Math.sqrt(va + vb)};
    }

    /** Mean and sample variance of per-user spend, zeros included. */
    private static double[] moments(Arm arm) {
        double n = arm.users();
        double mean = arm.sum() / n;
        double ss = 0;
        for (double y : arm.spend()) {
            ss += (y - mean) * (y - mean);
        }
        ss += (n - arm.spend().length) * mean * mean;
        return new double[] {mean, ss / (n - 1)};
    }

    /** Percentile bootstrap of mean(B) - mean(A), resampling users (drawn through the payers; see the class comment). */
    static double[] bootstrap(Arm a, Arm b, UniformRandomProvider rng, double level) {
        double[] d = new double[RESAMPLES];
        for (int r = 0; r < RESAMPLES; r++) {
            d[r] = resampledMean(b, rng) - resampledMean(a, rng);
        }
        Arrays.sort(d);
        return new double[] {d[(int) Math.floor((0.5 - level / 2) * (RESAMPLES - 1))],
            d[(int) Math.ceil((0.5 + level / 2) * (RESAMPLES - 1))]};
    }

    private static double resampledMean(Arm arm, UniformRandomProvider rng) {
        int m = arm.spend().length;
        if (m == 0) {
            return 0;
        }
        double[] day = new double[4];
        DailyStats.of(new ArmTruth(arm.users(), (double) m / arm.users(), 0, 1)).start(rng).next(day);
        long drawn = (long) day[1];
        double sum = 0;
        for (long i = 0; i < drawn; i++) {
            sum += arm.spend()[rng.nextInt(m)];
        }
        return sum / arm.users();
    }

    /** The textbook bootstrap: each resample draws n users with replacement from all n (zeros included). */
    static double textbookBootstrapSeconds(Arm a, Arm b, UniformRandomProvider rng) {
        long t0 = System.nanoTime();
        double[] d = new double[RESAMPLES];
        for (int r = 0; r < RESAMPLES; r++) {
            d[r] = fullResample(b, rng) - fullResample(a, rng);
        }
        Arrays.sort(d);
        return (System.nanoTime() - t0) / 1e9;
    }

    private static double fullResample(Arm arm, UniformRandomProvider rng) {
        long n = arm.users();
        int m = arm.spend().length;
        double sum = 0;
        for (long i = 0; i < n; i++) {
            long j = rng.nextLong(n);
            sum += j < m ? arm.spend()[(int) j] : 0; // users 0..m-1 are the payers, the rest spend 0
        }
        return sum / n;
    }

    static Outcome experiment(Setting s, long index, long seed) {
        return experiment(s, index, seed, true);
    }

    /** One experiment; without the bootstrap its coverage is reported false and its time 0. */
    static Outcome experiment(Setting s, long index, long seed, boolean withBootstrap) {
        // one long per experiment, expanded into the generator's state by SplitMix64 (a long[] of small numbers
        // would be taken as the state itself, and xoshiro's first outputs from such a state are nearly equal)
        long key = ((seed * 31 + s.law().ordinal()) * 10_000_019L + s.users()) * 1_000_003L + index;
        UniformRandomProvider rng = RandomSource.XO_SHI_RO_256_PP.create(key);
        double payerRate = 0.01 + 0.04 * rng.nextDouble();
        double sd = 1.0 + rng.nextDouble();
        Arm a = arm(rng, s.users(), payerRate, sd, s.law(), 1);
        Arm b = arm(rng, s.users(), payerRate, sd, s.law(), 1 + LIFT);
        double arpuA = payerRate * s.law().mean(sd);
        double trueDifference = LIFT * arpuA;
        long t0 = System.nanoTime();
        Comparison c = cairn(a, b, index + 1);
        long t1 = System.nanoTime();
        double[] w = welch(a, b, 0.95);
        long t2 = System.nanoTime();
        double[] boot = withBootstrap ? bootstrap(a, b, rng, 0.95) : new double[] {Double.NaN, Double.NaN};
        long t3 = System.nanoTime();
        return new Outcome(s, payerRate * s.users(), covers(c.lift().lo(), c.lift().hi(), LIFT),
                covers(c.difference().lo(), c.difference().hi(), trueDifference), covers(w[0], w[1], trueDifference),
                covers(boot[0], boot[1], trueDifference), (t1 - t0) / 1e9, (t2 - t1) / 1e9, (t3 - t2) / 1e9);
    }

    private static boolean covers(double lo, double hi, double truth) {
        return lo <= truth && truth <= hi;
    }

    /**
     * Runs every experiment of the given classes.
     *
     * @param settings    the classes
     * @param experiments experiments per class
     * @param seed        the seed
     * @return the outcomes, class by class
     */
    static List<Outcome> run(List<Setting> settings, int[] experiments, long seed) {
        List<Outcome> out = new ArrayList<>();
        for (int k = 0; k < settings.size(); k++) {
            for (int e = 0; e < experiments[k]; e++) {
                out.add(experiment(settings.get(k), e, seed));
            }
        }
        return out;
    }

    /** Coverage as "95.1% ± 1.2" (two standard errors). */
    static String coverage(List<Outcome> rows, java.util.function.Predicate<Outcome> covered) {
        double p = rows.stream().filter(covered).count() / (double) rows.size();
        return String.format(Locale.ROOT, "%5.1f%% ± %.1f", 100 * p, 200 * Math.sqrt(p * (1 - p) / rows.size()));
    }

    static double median(List<Outcome> rows, java.util.function.ToDoubleFunction<Outcome> f) {
        double[] x = rows.stream().mapToDouble(f).sorted().toArray();
        return x[x.length / 2];
    }

    public static void main(String[] args) {
        int lognormal = args.length > 0 ? Integer.parseInt(args[0]) : 334;
        int other = args.length > 1 ? Integer.parseInt(args[1]) : 100;
        List<Setting> settings = new ArrayList<>();
        List<Integer> counts = new ArrayList<>();
        for (int users : new int[] {10_000, 100_000, 1_000_000}) {
            settings.add(new Setting(Law.LOGNORMAL, users));
            counts.add(lognormal);
        }
        for (Law law : new Law[] {Law.PARETO, Law.WHALES}) {
            for (int users : new int[] {10_000, 100_000, 1_000_000}) {
                settings.add(new Setting(law, users));
                counts.add(other);
            }
        }
        // warm up every path before timing
        run(List.of(new Setting(Law.LOGNORMAL, 10_000)), new int[] {20}, 99);
        List<Outcome> all = run(settings, counts.stream().mapToInt(Integer::intValue).toArray(), 1);
        System.out.println("95% intervals; coverage ± two standard errors; median seconds per analysis (data in memory)");
        System.out.printf(Locale.ROOT, "%-10s %9s %5s  %-14s %-14s %-14s %-14s  %9s %9s %9s %12s%n", "spend law", "users/arm",
                "runs", "cairn lift", "cairn diff", "Welch t diff", "bootstrap", "cairn s", "Welch s", "boot s", "textbook s");
        for (Setting s : settings) {
            List<Outcome> rows = all.stream().filter(o -> o.setting().equals(s)).toList();
            Arm a = arm(RandomSource.XO_SHI_RO_256_PP.create(7L), s.users(), 0.03, 1.5, s.law(), 1);
            Arm b = arm(RandomSource.XO_SHI_RO_256_PP.create(8L), s.users(), 0.03, 1.5, s.law(), 1 + LIFT);
            double textbook = textbookBootstrapSeconds(a, b, RandomSource.XO_SHI_RO_256_PP.create(9L));
            System.out.printf(Locale.ROOT, "%-10s %,9d %5d  %-14s %-14s %-14s %-14s  %9.4f %9.5f %9.4f %12.3f%n",
                    s.law().name().toLowerCase(Locale.ROOT), s.users(), rows.size(), coverage(rows, Outcome::cairnLift),
                    coverage(rows, Outcome::cairnDifference), coverage(rows, Outcome::welch), coverage(rows, Outcome::bootstrap),
                    median(rows, Outcome::cairnSeconds), median(rows, Outcome::welchSeconds),
                    median(rows, Outcome::bootstrapSeconds), textbook);
        }
        int more = args.length > 2 ? Integer.parseInt(args[2]) : 2000;
        System.out.println();
        System.out.printf(Locale.ROOT, "Lognormal spend, %,d more experiments per class, cairn and Welch only (no bootstrap: "
                + "too slow at this count), for coverage within a narrower error:%n", more);
        for (int users : new int[] {10_000, 100_000, 1_000_000}) {
            Setting s = new Setting(Law.LOGNORMAL, users);
            List<Outcome> rows = new ArrayList<>();
            for (int e = 0; e < more; e++) {
                rows.add(experiment(s, 1_000_000 + e, 2, false));
            }
            System.out.printf(Locale.ROOT, "  %,9d users/arm  cairn lift %s  cairn diff %s  Welch %s%n", users,
                    coverage(rows, Outcome::cairnLift), coverage(rows, Outcome::cairnDifference), coverage(rows, Outcome::welch));
        }
        System.out.println();
        System.out.println("Lognormal spend by payers per arm (where the intervals rest on few payers):");
        double[][] bins = {{0, 300}, {300, 3000}, {3000, Double.MAX_VALUE}};
        for (double[] bin : bins) {
            List<Outcome> rows = all.stream().filter(o -> o.setting().law() == Law.LOGNORMAL
                    && o.payers() >= bin[0] && o.payers() < bin[1]).toList();
            if (!rows.isEmpty()) {
                System.out.printf(Locale.ROOT, "  %-16s %5d  cairn lift %s  cairn diff %s  Welch %s  bootstrap %s%n",
                        bin[1] == Double.MAX_VALUE ? ">= " + (int) bin[0] : (int) bin[0] + "-" + (int) bin[1], rows.size(),
                        coverage(rows, Outcome::cairnLift), coverage(rows, Outcome::cairnDifference),
                        coverage(rows, Outcome::welch), coverage(rows, Outcome::bootstrap));
            }
        }
    }
}
