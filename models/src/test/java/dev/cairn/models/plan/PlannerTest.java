package dev.cairn.models.plan;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.ResultWriter;
import dev.cairn.samplers.Progress;
import java.nio.file.Path;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

/**
 * The plan simulator against outside answers, and its own invariants.
 *
 * <p>Power of a one-sided two-proportion z-test at level alpha with n users per arm, by the normal
 * approximation (Fleiss, Levin &amp; Paik 2003, "Statistical Methods for Rates and Proportions", 3rd ed.,
 * chapter 4; the formula from memory): power = Phi((|p2 - p1| sqrt(n) - z_(1-alpha) sqrt(2 pbar qbar)) /
 * sqrt(p1 q1 + p2 q2)), pbar = (p1 + p2) / 2. With flat priors and large samples the posterior P(p2 > p1)
 * is Phi of the unpooled z statistic, so "ship when P(beat control) > 0.95" at one look has that power.
 */
class PlannerTest {
    private static final NormalDistribution N = new NormalDistribution(0, 1);

    static double fleissPower(double p1, double p2, double n, double alpha) {
        double pbar = (p1 + p2) / 2;
        return N.cumulativeProbability((Math.abs(p2 - p1) * Math.sqrt(n)
                - N.inverseCumulativeProbability(1 - alpha) * Math.sqrt(2 * pbar * (1 - pbar)))
                / Math.sqrt(p1 * (1 - p1) + p2 * (1 - p2)));
    }

    private static PlanSpec plan(String json) {
        return PlanReader.parse(json, "plan.json", Path.of("."));
    }

    private static String conversionPlan(String lift, int usersPerDay, int days, int experiments, long seed) {
        return """
            {"arms": {"control": {}, "new": {"payerRateLift": %s}}, "control": "control", "usersPerDay": %d,
             "baseline": {"payerRate": 0.10}, "priors": {"payerRate": {"family": "beta", "a": 1, "b": 1}},
             "decision": {"metric": "payerRate", "rule": "prob-above", "threshold": 0.95},
             "schedule": {"minDays": %d, "maxDays": %d}, "simulation": {"experiments": %d, "seed": %d}}
            """.formatted(lift, usersPerDay, days, days, experiments, seed);
    }

    @Test
    void fixedHorizonPowerMatchesTheOneSidedTwoProportionZTest() {
        int experiments = 10_000;
        double se = Math.sqrt(0.25 / experiments);
        for (double lift : new double[] {0.05, 0.08}) {
            PlanResult r = Planner.run(plan(conversionPlan(Double.toString(lift), 2_000, 14, experiments, 5)), 2,
                    Progress.NONE);
            double expected = fleissPower(0.10, 0.10 * (1 + lift), 28_000, 0.05);
            System.out.printf("PlannerTest: lift %.2f power %.4f, Fleiss et al. %.4f%n", lift, r.atStop().power(), expected);
            assertEquals(expected, r.atStop().power(), 4 * se, "power at lift " + lift);
        }
    }

    @Test
    void underNoEffectTheOneLookRuleShipsAtTheNominalRate() {
        PlanResult r = Planner.run(plan(conversionPlan("0", 2_000, 14, 10_000, 6)), 2, Progress.NONE);
        assertEquals(0.05, r.atStop().shipNotBetterShare(), 4 * Math.sqrt(0.05 * 0.95 / 10_000));
        assertEquals(0, r.atStop().shipWorseShare(), "no arm is truly worse when all are equal");
    }

    @Test
    void assuranceIsPowerAveragedOverThePlausibleLifts() {
        // O'Hagan, Stevens & Campbell (2005): assurance = integral of power(lift) over the lift's distribution
        double mean = 0.05, sd = 0.05;
        PlanResult r = Planner.run(plan(conversionPlan("{\"family\": \"normal\", \"mean\": 0.05, \"sd\": 0.05}", 2_000, 14,
                10_000, 7)), 2, Progress.NONE);
        double expected = 0, step = sd / 200;
        for (double lift = mean - 8 * sd; lift <= mean + 8 * sd; lift += step) {
            double power = lift > 0 ? fleissPower(0.10, 0.10 * (1 + lift), 28_000, 0.05)
                    : 1 - fleissPower(0.10, 0.10 * (1 + lift), 28_000, 0.95); // a negative lift: P(z still above z_0.95)
            expected += power * N.density((lift - mean) / sd) / sd * step;
        }
        assertEquals(null, r.atStop().power());
        System.out.printf("PlannerTest: assurance %.4f, integral of the power curve %.4f%n", r.atStop().assurance(), expected);
        assertEquals(expected, r.atStop().assurance(), 4 * Math.sqrt(0.25 / 10_000));
    }

    private static final String SPEND_PLAN = """
        {"arms": {"A": {}, "B": {"arppuLift": 0.04}, "C": {"payerRateLift": {"family": "uniform", "lower": -0.05, "upper": 0.08}}},
         "control": "A", "usersPerDay": {"A": 3000, "B": 3000, "C": 2000},
         "baseline": {"payerRate": 0.03, "logSpendMean": 1.0, "logSpendSd": 1.4},
         "schedule": {"minDays": 5, "maxDays": 21, "lookEvery": 2}, "simulation": {"experiments": 600, "seed": 9}}
        """;

    @Test
    void sameFiguresOnAnyNumberOfThreads() {
        PlanSpec p = plan(SPEND_PLAN);
        PlanResult one = Planner.run(p, 1, Progress.NONE);
        PlanResult three = Planner.run(p, 3, Progress.NONE);
        assertEquals(ResultWriter.jsonOf(one.atStop()), ResultWriter.jsonOf(three.atStop()));
        assertEquals(ResultWriter.jsonOf(one.days()), ResultWriter.jsonOf(three.days()));
        assertEquals(ResultWriter.jsonOf(one.assumptions()), ResultWriter.jsonOf(three.assumptions()));
    }

    @Test
    void figuresAddUp() {
        PlanResult r = Planner.run(plan(SPEND_PLAN), 2, Progress.NONE);
        PlanResult.AtStop s = r.atStop();
        assertEquals(1, s.decidedShare() + s.undecidedShare(), 1e-12);
        assertEquals(s.decidedShare(), s.shipShare() + s.keepControlShare(), 1e-12);
        assertEquals(1, s.acted().values().stream().mapToDouble(Double::doubleValue).sum(), 1e-12);
        assertTrue(s.shipWorseShare() <= s.shipNotBetterShare() && s.shipBestShare() <= s.shipBetterShare() + 1e-12);
        PlanResult.Day last = r.days().get(r.days().size() - 1);
        assertEquals(21, last.day());
        assertEquals(s.decidedShare(), last.sequential().stoppedShare(), 1e-12);
        assertEquals(s.shipShare(), last.sequential().shipShare(), 1e-12);
        assertEquals(java.util.List.of(5, 7, 9, 11, 13, 15, 17, 19, 21), r.settings().lookDays());
        double stopping = r.days().stream().mapToDouble(d -> d.sequential().stoppingShare()).sum();
        assertEquals(s.decidedShare(), stopping, 1e-12);
        PlanResult.Duration d = s.duration();
        assertTrue(5 <= d.p10() && d.p10() <= d.p25() && d.p25() <= d.median() && d.median() <= d.p75()
                && d.p75() <= d.p90() && d.p90() <= 21, d.toString());
        // the first look decides the same in both views
        assertEquals(r.days().get(0).fixed().decidedShare(), r.days().get(0).sequential().stoppedShare(), 1e-12);
        // C's payer-rate lift is drawn, so the plan reports assurance
        assertEquals(null, s.power());
        assertEquals(s.shipShare(), s.assurance(), 1e-12);
        assertEquals(0.04, r.assumptions().arms().get("B").lift(), 1e-12);
    }

    @Test
    void approximateAndExactDrawsGiveTheSameFiguresWithinMonteCarloError() {
        String base = """
            {"arms": {"A": {}, "B": {"arppuLift": 0.05}}, "control": "A", "usersPerDay": 4000,
             "baseline": {"payerRate": 0.03, "logSpendMean": 1.0, "logSpendSd": 1.4},
             "schedule": {"minDays": 3, "maxDays": 15, "lookEvery": 3}, "simulation": {"experiments": 1500, "seed": 21, %s}}
            """;
        PlanResult fast = Planner.run(plan(base.formatted("\"method\": \"approximate\"")), 2, Progress.NONE);
        PlanResult exact = Planner.run(plan(base.formatted("\"method\": \"draws\", \"draws\": 2000")), 2, Progress.NONE);
        double se = Math.sqrt(2 * 0.25 / 1500);
        assertEquals(exact.atStop().shipShare(), fast.atStop().shipShare(), 4 * se);
        assertEquals(exact.atStop().decidedShare(), fast.atStop().decidedShare(), 4 * se);
        assertEquals(exact.atStop().duration().mean(), fast.atStop().duration().mean(), 1.0);
        for (int l = 0; l < fast.days().size(); l++) {
            assertEquals(exact.days().get(l).fixed().shipShare(), fast.days().get(l).fixed().shipShare(), 4 * se);
            assertEquals(0, fast.days().get(l).fixed().drawsShare(), "12,000 users a look: the approximation applies");
        }
    }
}
