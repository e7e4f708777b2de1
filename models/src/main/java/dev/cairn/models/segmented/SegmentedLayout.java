package dev.cairn.models.segmented;

import dev.cairn.models.prior.HalfNormal;
import dev.cairn.models.prior.Normal;

import dev.cairn.samplers.Parameters;
import java.util.Locale;

/**
 * The named coordinates of the segmented-spend posterior and the three structures that own them: payer-rate
 * logits, mean log spend and log spread ({@link HierarchicalCells}).
 *
 * <p>Which segments are centred is decided here, from the data alone and before sampling (so the sampler
 * stays a fixed, valid kernel), by comparing each segment's own noise with the spread between segments
 * (centring pays when the data outweigh the prior: Papaspiliopoulos, Roberts & Skold 2007, Statistical
 * Science 22(1)). The between-segment variances tau^2 of levels and of arm effects are estimated by moments
 * from the raw per-segment estimates ({@link MomentSpread}); a segment's level (or its arm effects) is
 * centred when the variance of its raw estimate is below tau^2, else non-centred. When the arm effects do
 * not vary between segments beyond their noise, every segment's effects are non-centred.
 * A spec's "parameterisation": "centred" or "non-centred" applies to every segment instead.
 */
final class SegmentedLayout {
    /** Hyperpriors (scale reasoning in {@link SegmentedDensity}). */
    static final HierarchicalCells.Prior PAYER = new HierarchicalCells.Prior(new Normal(-3, 2), new Normal(0, 1),
            new HalfNormal(1), new HalfNormal(0.5));
    static final HierarchicalCells.Prior MEAN = new HierarchicalCells.Prior(new Normal(0, 5), new Normal(0, 1),
            new HalfNormal(1), new HalfNormal(0.5));
    static final HierarchicalCells.Prior SPREAD = new HierarchicalCells.Prior(new Normal(0, 1), new Normal(0, 0.5),
            new HalfNormal(0.5), null);

    final Parameters parameters;
    final HierarchicalCells payer;
    final HierarchicalCells mean;
    final HierarchicalCells spread;
    final int centredLevels;
    final int centredEffects;
    /** The segments' own estimates behind the choice (also where chains start). */
    final RawEstimates raw;
    /** Coordinates [0, payerEnd) belong to the payer-rate structure, the rest to the spend structures. */
    final int payerEnd;

    private SegmentedLayout(Parameters parameters, HierarchicalCells payer, HierarchicalCells mean,
                            HierarchicalCells spread, int centredLevels, int centredEffects, RawEstimates raw,
                            int payerEnd) {
        this.raw = raw;
        this.payerEnd = payerEnd;
        this.parameters = parameters;
        this.payer = payer;
        this.mean = mean;
        this.spread = spread;
        this.centredLevels = centredLevels;
        this.centredEffects = centredEffects;
    }

    /**
     * @param cells            the data
     * @param parameterisation "auto" (or null), "centred" or "non-centred"
     */
    static SegmentedLayout of(SegmentedCells cells, String parameterisation) {
        int segs = cells.segmentCount();
        RawEstimates raw = RawEstimates.of(cells);
        boolean[][] levelNc = new boolean[3][];
        boolean[][] effectNc = new boolean[2][];
        for (int s = 0; s < 3; s++) {
            levelNc[s] = nonCentred(raw.levelVariance[s], raw.levelSpread(s), parameterisation);
        }
        for (int s = 0; s < 2; s++) {
            effectNc[s] = nonCentred(raw.effectVariance[s], raw.effectSpread(s), parameterisation);
        }
        int centredLevels = 0, centredEffects = 0;
        for (int j = 0; j < segs; j++) {
            centredLevels += levelNc[0][j] ? 0 : 1;
            centredEffects += effectNc[0][j] ? 0 : 1;
        }
        Parameters.Builder names = Parameters.builder();
        int[] next = {0};
        HierarchicalCells payer = structure(names, next, cells, PAYER, false, "alpha0", "tauAlpha", "tauD", "D",
                "alpha", "logitPayerRate", "d", levelNc[0], effectNc[0]);
        int payerEnd = next[0];
        HierarchicalCells mean = null, spread = null;
        if (cells.spend) {
            mean = structure(names, next, cells, MEAN, false, "beta0", "tauBeta", "tauE", "E", "beta", "logSpendMean",
                    "e", levelNc[1], effectNc[1]);
            spread = structure(names, next, cells, SPREAD, true, "s0", "tauS", null, "G", "logSigma", null, null,
                    levelNc[2], null);
        }
        return new SegmentedLayout(names.build(), payer, mean, spread, centredLevels, centredEffects, raw, payerEnd);
    }

    /** Per segment: non-centred unless its raw estimate's variance is below the between-segment variance. */
    private static boolean[] nonCentred(double[] noise, double between, String parameterisation) {
        boolean[] out = new boolean[noise.length];
        for (int j = 0; j < noise.length; j++) {
            boolean centred = "centred".equals(parameterisation)
                    || (!"non-centred".equals(parameterisation) && noise[j] < between);
            out[j] = !centred;
        }
        return out;
    }

    private static HierarchicalCells structure(Parameters.Builder names, int[] next, SegmentedCells cells,
                                               HierarchicalCells.Prior prior, boolean shared, String levelMean,
                                               String tauLevel, String tauEffect, String armMean, String level,
                                               String centredEffect, String rawEffect, boolean[] levelNc,
                                               boolean[] effectNc) {
        int segs = cells.segmentCount(), arms = cells.armCount();
        int lm = add(names, next, levelMean);
        int ltl = add(names, next, "log " + tauLevel);
        int lte = shared ? -1 : add(names, next, "log " + tauEffect);
        int[] am = new int[arms];
        for (int k = 0; k < arms; k++) {
            am[k] = k == cells.control ? -1 : add(names, next, armMean + "[" + cells.arms.get(k) + "]");
        }
        int[] lv = new int[segs];
        int[][] ef = shared ? null : new int[segs][arms];
        for (int j = 0; j < segs; j++) {
            String seg = cells.segments.get(j);
            lv[j] = add(names, next, (levelNc[j] ? level + " raw" : level) + "[" + seg + "]");
            if (!shared) {
                for (int k = 0; k < arms; k++) {
                    ef[j][k] = k == cells.control ? -1 : add(names, next, (effectNc[j] ? rawEffect + " raw" : centredEffect)
                            + "[" + seg + "/" + cells.arms.get(k) + "]");
                }
            }
        }
        return new HierarchicalCells(prior, segs, arms, cells.control, shared, lm, ltl, lte, am, lv, ef, levelNc,
                shared ? new boolean[segs] : effectNc);
    }

    private static int add(Parameters.Builder names, int[] next, String name) {
        names.real(name);
        return next[0]++;
    }

    int size() {
        return parameters.size();
    }

    /** What the run record says about the parameterisation. */
    String describe(String requested) {
        int segs = payer.segments;
        String how = requested == null || requested.equals("auto") ? "auto, by payers per segment" : "as the spec asks";
        return String.format(Locale.ROOT, "payer-rate levels centred in %d of %d segments, arm effects in %d (%s)",
                centredLevels, segs, centredEffects, how);
    }
}
