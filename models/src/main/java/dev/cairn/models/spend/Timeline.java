package dev.cairn.models.spend;

import dev.cairn.models.data.TimelineData;
import dev.cairn.models.decision.Decisions;
import dev.cairn.models.plan.LookRule;
import dev.cairn.models.result.Decision;
import dev.cairn.models.result.Interval;
import dev.cairn.models.result.Metric;
import dev.cairn.models.result.TimelineDay;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.apache.commons.rng.JumpableUniformRandomProvider;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;

/**
 * A running test's timeline: for each period, the data up to its end (running sums of the periods'
 * statistics), exact conjugate posterior draws of the decided metric, and from them — as the fit's decision
 * block computes them ({@link Decisions#decide}) — the lifts, P(best), expected losses and the outcome.
 * Period p draws from the seed's xoshiro256++ generator advanced by p + 1 jumps, so the timeline is the same
 * on any thread count.
 */
public final class Timeline {
    private Timeline() {
    }

    /**
     * Builds the timeline.
     *
     * @param periods   the periods' own statistics, in time order
     * @param arms      the arms
     * @param control   the control
     * @param metric    the decided metric
     * @param priors    conjugate priors
     * @param tolerance the decision's tolerance, or null for the default
     * @param level     the intervals' mass
     * @param currency  the currency, or null
     * @param seed      the seed
     * @param draws     posterior draws per period and arm
     * @return one entry per period
     */
    public static List<TimelineDay> of(List<TimelineData.Period> periods, List<String> arms, String control, Metric metric,
                                       SpendPriors priors, Double tolerance, double level, String currency, long seed,
                                       int draws) {
        int k = arms.size();
        int c = arms.indexOf(control);
        LookRule rule = new LookRule(LookRule.Kind.EXPECTED_LOSS, metric, c, tolerance, 0.95, priors.payerRate(),
                priors.logSpend() != null ? priors.logSpend() : SpendPriors.DEFAULT_LOG_SPEND, false, draws);
        JumpableUniformRandomProvider master = (JumpableUniformRandomProvider) RandomSource.XO_SHI_RO_256_PP.create(seed);
        double[][] sums = new double[k][4];
        List<TimelineDay> out = new ArrayList<>();
        for (TimelineData.Period p : periods) {
            UniformRandomProvider rng = master.jump();
            Map<String, Long> users = new LinkedHashMap<>(), payers = new LinkedHashMap<>();
            boolean empty = false;
            for (int a = 0; a < k; a++) {
                for (int j = 0; j < 4; j++) {
                    sums[a][j] += p.stats()[a][j];
                }
                users.put(arms.get(a), (long) sums[a][0]);
                payers.put(arms.get(a), (long) sums[a][1]);
                empty |= sums[a][0] == 0 || (metric != Metric.PAYER_RATE && sums[a][1] == 0
                        && "default".equals(priors.source()));
            }
            if (empty) {
                out.add(new TimelineDay(p.time(), users, payers, null, null, null, "no-decision", null));
                continue;
            }
            double[][] x = rule.posteriorDraws(sums, rng);
            Decision d = Decisions.decide(arms, control, metric, arm -> x[arms.indexOf(arm)], tolerance, level, currency);
            Map<String, Interval> lift = new LinkedHashMap<>();
            Map<String, Double> best = new LinkedHashMap<>(), loss = new LinkedHashMap<>();
            for (Decision.ArmDecision a : d.arms()) {
                if (!a.arm().equals(control)) {
                    lift.put(a.arm(), a.lift());
                }
                best.put(a.arm(), a.probBest());
                loss.put(a.arm(), a.expectedLoss());
            }
            out.add(new TimelineDay(p.time(), users, payers, lift, best, loss, d.outcome(), d.arm()));
        }
        return out;
    }
}
