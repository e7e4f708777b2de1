package dev.cairn.models.segmented;

import java.util.function.DoubleUnaryOperator;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/**
 * Random-walk Metropolis steps of one log scale, per chain: proposals l + step z, z standard normal,
 * accepted with the ratio of the log density. In warmup the step size adapts after each proposal by a
 * Robbins-Monro rule, log step += (accepted - 0.44) / sqrt(proposals so far), towards the acceptance rate
 * 0.44 that is efficient for one-dimensional random walks (Roberts & Rosenthal 2001, Statistical Science
 * 16(4)); after warmup it is frozen, so the kept draws come from a fixed kernel. Two log-density
 * evaluations for the first proposal, one for each further one: cheaper than a slice update where one
 * evaluation is a pass over every cell.
 */
final class ScaleWalk {
    private final UniformRandomProvider rng;
    private final ZigguratSampler.NormalizedGaussian normal;
    private double step = 0.5;
    private long proposals;

    /**
     * @param rng the chain's random stream
     */
    ScaleWalk(UniformRandomProvider rng) {
        this.rng = rng;
        this.normal = ZigguratSampler.NormalizedGaussian.of(rng);
    }

    /**
     * @param density the log density of the log scale (up to a constant; non-finite means zero)
     * @param current the current log scale
     * @param moves   how many proposals, >= 1
     * @param adapt   true in warmup
     * @return the new log scale
     */
    double move(DoubleUnaryOperator density, double current, int moves, boolean adapt) {
        double l = current, f = density.applyAsDouble(current);
        for (int i = 0; i < moves; i++) {
            double proposal = l + step * normal.sample();
            double next = density.applyAsDouble(proposal);
            boolean accept = Double.isFinite(next) && Math.log(rng.nextDouble()) < next - f;
            if (accept) {
                l = proposal;
                f = next;
            }
            if (adapt) {
                proposals++;
                step *= Math.exp(((accept ? 1 : 0) - 0.44) / Math.sqrt(proposals));
            }
        }
        return l;
    }
}
