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
import dev.cairn.samplers.Step;
import dev.cairn.samplers.Sweep;

/**
 * The segmented-spend posterior ready to sample: the cells ({@link SegmentedCells}), the named coordinates
 * ({@link SegmentedLayout}), the density with its gradient ({@link SegmentedDensity}, where the model is
 * written out) and the update schedules.
 *
 * <p>"segment-gibbs" (the default): given the hyperparameters the segments are independent, so each
 * segment's coordinates are drawn as one block from their conditional (payer rates by an independence
 * Metropolis-Hastings proposal from the conditional's mode, {@link PayerSegments}; mean log spend exactly
 * and log spread by slice sampling, {@link SpendSegments}), and the hyperparameters move by centred and
 * non-centred (interweaving) moves ({@link HyperStep}), partially non-centred scale moves
 * ({@link EffectScaleMove}, {@link LevelScaleMove}) and collapsed updates of the spend levels and arm effects
 * ({@link CollapsedSpendLevels}, {@link CollapsedSpendEffects}). One sweep costs O(cells), with no
 * trajectory of gradient evaluations.
 *
 * <p>"nuts": one No-U-Turn transition per iteration over the payer-rate coordinates on the payer-rate part of
 * the density, then one over the spend coordinates on the spend part (the two parts share no parameter, so
 * each block's part is its full conditional), each followed by the same hyperparameter moves. "slice" and
 * "metropolis-within-gibbs" update one coordinate at a time through the same density (slow beyond a few
 * segments, kept for comparison).
 */
final class SegmentedPosterior {
    static final String SEGMENT_GIBBS = "segment-gibbs", NUTS = "nuts", AUTO = SEGMENT_GIBBS;
    /**
     * The default warmup of segment-gibbs: its blocks are drawn from their conditionals, so warmup only
     * forgets the start and sets slice widths and one random-walk step size (NUTS adapts a step size and a
     * metric and keeps the spec's default of 1,000).
     */
    static final int GIBBS_WARMUP = 300;
    final SegmentedCells cells;
    final SegmentedLayout layout;
    final SegmentedDensity density;

    SegmentedPosterior(SegmentedSpendData data, String controlArm, String parameterisation) {
        this.cells = new SegmentedCells(data, controlArm);
        this.layout = SegmentedLayout.of(cells, parameterisation);
        this.density = new SegmentedDensity(cells, layout);
    }

    /**
     * Runs the chains, keeping the named quantities of each draw ({@link SegmentedOutputs}).
     *
     * @param weights per segment, its share of users (sum 1), for the population quantities
     */
    Draws sample(String method, RunSettings settings, Progress progress, Cancellation cancellation, double[] weights) {
        Sweep sweep = switch (method) {
            case "slice" -> Sweep.of(SliceStep.of(1.0));
            case "metropolis-within-gibbs" -> Sweep.of(MetropolisStep.of(0.5));
            case NUTS -> cells.spend
                    ? Sweep.of(NutsStep.of(settings.warmup(), range(0, layout.payerEnd), 10, 0.8).on(density.part(true)),
                            payerHypers(), payerScale(),
                            NutsStep.of(settings.warmup(), range(layout.payerEnd, layout.size()), 10, 0.8).on(density.part(false)),
                            meanHypers(), new CollapsedSpendLevels(cells, layout), spreadHypers())
                    : Sweep.of(NutsStep.of(settings.warmup()), payerHypers(), payerScale());
            default -> Sweep.of(gibbs().toArray(new Step[0]));
        };
        return ChainRunner.of(settings).withProgress(progress).withCancellation(cancellation)
                .run(density, sweep, (chain, p, rng) -> density.start(rng),
                        SegmentedOutputs.recording(cells, layout, weights));
    }

    /**
     * The segment-gibbs schedule. The partially non-centred scale moves of the levels run only when some
     * segment's levels are stored non-centred, that is when some segment's data are weak against the
     * spread between segments; where every segment's data pin its level the centred move of the scale
     * mixes well on its own.
     */
    private java.util.List<Step> gibbs() {
        java.util.List<Step> steps = new java.util.ArrayList<>(java.util.List.of(new PayerSegments(cells, layout.payer),
                payerHypers(), payerScale()));
        if (anyNonCentred(layout.payer)) {
            steps.add(payerLevelScale());
        }
        if (cells.spend) {
            steps.addAll(java.util.List.of(new SpendSegments(cells, layout), meanHypers(),
                    new CollapsedSpendLevels(cells, layout), new CollapsedSpendEffects(cells, layout), spreadHypers()));
            if (anyNonCentred(layout.spread)) {
                steps.add(spreadLevelScale());
            }
        }
        return steps;
    }

    private static boolean anyNonCentred(HierarchicalCells structure) {
        for (boolean nc : structure.levelNc) {
            if (nc) {
                return true;
            }
        }
        return false;
    }

    private HyperStep payerHypers() {
        return new HyperStep(layout.payer, SegmentedLayout.PAYER, density.payerCells());
    }

    private EffectScaleMove payerScale() {
        double[][] pseudo = EffectScaleMove.payerEstimates(cells);
        return new EffectScaleMove(layout.payer, SegmentedLayout.PAYER, density.payerCells(), pseudo[0], pseudo[1]);
    }

    private HyperStep meanHypers() {
        return new HyperStep(layout.mean, SegmentedLayout.MEAN, density.meanCells());
    }

    private HyperStep spreadHypers() {
        return new HyperStep(layout.spread, SegmentedLayout.SPREAD, density.spreadCells());
    }

    private LevelScaleMove payerLevelScale() {
        double[][] pseudo = EffectScaleMove.payerEstimates(cells);
        return new LevelScaleMove(layout.payer, SegmentedLayout.PAYER, density.payerCells(), pseudo[0], pseudo[1]);
    }

    private LevelScaleMove spreadLevelScale() {
        return new LevelScaleMove(layout.spread, SegmentedLayout.SPREAD, density.spreadCells(), null, null);
    }

    private static int[] range(int from, int to) {
        return java.util.stream.IntStream.range(from, to).toArray();
    }
}
