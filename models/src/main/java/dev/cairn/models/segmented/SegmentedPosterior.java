package dev.cairn.models.segmented;

import dev.cairn.models.data.SegmentedSpendData;
import dev.cairn.samplers.Cancellation;
import dev.cairn.samplers.ChainRunner;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.MetropolisStep;
import dev.cairn.samplers.NutsStep;
import dev.cairn.samplers.Progress;
import dev.cairn.samplers.RunSettings;
import dev.cairn.samplers.SliceStep;
import dev.cairn.samplers.Sweep;

/**
 * The segmented-spend posterior ready to sample: the cells ({@link SegmentedCells}), the named coordinates
 * ({@link SegmentedLayout}), the density with its gradient ({@link SegmentedDensity}, where the model is
 * written out) and the update schedule: by default one No-U-Turn transition per iteration over the
 * payer-rate coordinates on the payer-rate part of the density, then one over the spend coordinates on the
 * spend part (the two parts share no parameter, so each block's part is its full conditional), each
 * followed by interweaving moves of its hyperparameters in the centred parameterisation ({@link HyperStep})
 * and, for the spend levels, a collapsed update ({@link CollapsedSpendLevels}); "slice" and "metropolis-within-gibbs" update one coordinate at a time through the same density
 * (slow beyond a few segments, kept for comparison).
 */
final class SegmentedPosterior {
    final SegmentedCells cells;
    final SegmentedLayout layout;
    final SegmentedDensity density;

    SegmentedPosterior(SegmentedSpendData data, String controlArm, String parameterisation) {
        this.cells = new SegmentedCells(data, controlArm);
        this.layout = SegmentedLayout.of(cells, parameterisation);
        this.density = new SegmentedDensity(cells, layout);
    }

    /** Runs the chains; the draws are of the coordinates (see {@link SegmentedOutputs} for named quantities). */
    Draws sample(String method, RunSettings settings, Progress progress, Cancellation cancellation) {
        Sweep sweep = switch (method) {
            case "slice" -> Sweep.of(SliceStep.of(1.0));
            case "metropolis-within-gibbs" -> Sweep.of(MetropolisStep.of(0.5));
            default -> cells.spend
                    ? Sweep.of(NutsStep.of(settings.warmup(), range(0, layout.payerEnd), 10, 0.8).on(density.part(true)),
                            new HyperStep(layout.payer, SegmentedLayout.PAYER, density::payerCell,
                                    layout.raw.effectVariance[0]),
                            NutsStep.of(settings.warmup(), range(layout.payerEnd, layout.size()), 10, 0.8).on(density.part(false)),
                            new HyperStep(layout.mean, SegmentedLayout.MEAN, density::meanCell,
                                    layout.raw.effectVariance[1]),
                            new CollapsedSpendLevels(cells, layout),
                            new HyperStep(layout.spread, SegmentedLayout.SPREAD, null, null))
                    : Sweep.of(NutsStep.of(settings.warmup()), new HyperStep(layout.payer, SegmentedLayout.PAYER,
                            density::payerCell, layout.raw.effectVariance[0]));
        };
        return ChainRunner.of(settings).withProgress(progress).withCancellation(cancellation)
                .run(density, sweep, (chain, p, rng) -> density.start(rng));
    }

    private static int[] range(int from, int to) {
        return java.util.stream.IntStream.range(from, to).toArray();
    }

    /** The named quantities (hyperparameters, per-cell, typical-segment and population) of internal draws. */
    Draws outputs(Draws internal, double[] weights) {
        return SegmentedOutputs.of(internal, cells, layout, weights);
    }
}
