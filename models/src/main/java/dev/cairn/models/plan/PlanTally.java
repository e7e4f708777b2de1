package dev.cairn.models.plan;

/** Counts and sums over simulated tests; one per block of tests, added in block order. */
final class PlanTally {
    final int arms, looks;
    long tests;
    // fixed horizon, per look
    final long[] decided, ship, shipWorse, shipNotBetter, shipBest, pickBest, drew;
    final double[] loss, regret;
    // sequential, per stop look; index looks = undecided
    final long[] stopAt, stopShip, stopKeep, stopShipWorse, stopShipNotBetter, stopShipBetter, stopShipBest, stopPickBest;
    final double[] stopLoss, stopRegret;
    final long[] acted;
    // assumptions
    final double[] valueSum, liftSum, bestShare;
    final double[] baseSum = new double[3];

    PlanTally(int arms, int looks) {
        this.arms = arms;
        this.looks = looks;
        decided = new long[looks];
        ship = new long[looks];
        shipWorse = new long[looks];
        shipNotBetter = new long[looks];
        shipBest = new long[looks];
        pickBest = new long[looks];
        drew = new long[looks];
        loss = new double[looks];
        regret = new double[looks];
        stopAt = new long[looks + 1];
        stopShip = new long[looks + 1];
        stopKeep = new long[looks + 1];
        stopShipWorse = new long[looks + 1];
        stopShipNotBetter = new long[looks + 1];
        stopShipBetter = new long[looks + 1];
        stopShipBest = new long[looks + 1];
        stopPickBest = new long[looks + 1];
        stopLoss = new double[looks + 1];
        stopRegret = new double[looks + 1];
        acted = new long[arms];
        valueSum = new double[arms];
        liftSum = new double[arms];
        bestShare = new double[arms];
    }

    void truth(double[] truth, int control, double[] base) {
        tests++;
        double max = max(truth);
        int ties = 0;
        for (double v : truth) {
            ties += v == max ? 1 : 0;
        }
        for (int a = 0; a < arms; a++) {
            valueSum[a] += truth[a];
            liftSum[a] += truth[a] / truth[control] - 1;
            bestShare[a] += truth[a] == max ? 1.0 / ties : 0;
        }
        for (int j = 0; j < 3; j++) {
            baseSum[j] += base[j];
        }
    }

    /** The arm acted on after a look: the shipped arm, else the control. */
    private static int acted(LookRule.Outcome o, int control) {
        return o.code == LookRule.SHIP ? o.arm : control;
    }

    void fixed(int look, LookRule.Outcome o, double[] truth, int control) {
        int arm = acted(o, control);
        boolean shipped = o.code == LookRule.SHIP;
        decided[look] += o.code != LookRule.KEEP_COLLECTING ? 1 : 0;
        ship[look] += shipped ? 1 : 0;
        shipWorse[look] += shipped && truth[arm] < truth[control] ? 1 : 0;
        shipNotBetter[look] += shipped && truth[arm] <= truth[control] ? 1 : 0;
        shipBest[look] += shipped && truth[arm] == max(truth) ? 1 : 0;
        pickBest[look] += truth[arm] == max(truth) ? 1 : 0;
        drew[look] += o.drew ? 1 : 0;
        loss[look] += o.loss[arm];
        regret[look] += max(truth) - truth[arm];
    }

    void stop(int look, LookRule.Outcome o, double[] truth, int control) {
        int arm = acted(o, control);
        boolean shipped = o.code == LookRule.SHIP;
        stopAt[look]++;
        stopShip[look] += shipped ? 1 : 0;
        stopKeep[look] += o.code == LookRule.KEEP_CONTROL ? 1 : 0;
        stopShipWorse[look] += shipped && truth[arm] < truth[control] ? 1 : 0;
        stopShipNotBetter[look] += shipped && truth[arm] <= truth[control] ? 1 : 0;
        stopShipBetter[look] += shipped && truth[arm] > truth[control] ? 1 : 0;
        stopShipBest[look] += shipped && truth[arm] == max(truth) ? 1 : 0;
        stopPickBest[look] += truth[arm] == max(truth) ? 1 : 0;
        stopLoss[look] += o.loss[arm];
        stopRegret[look] += max(truth) - truth[arm];
        acted[arm]++;
    }

    void undecided(LookRule.Outcome last, double[] truth, int control) {
        stopAt[looks]++;
        stopPickBest[looks] += truth[control] == max(truth) ? 1 : 0;
        stopLoss[looks] += last.loss[control];
        stopRegret[looks] += max(truth) - truth[control];
        acted[control]++;
    }

    void add(PlanTally t) {
        tests += t.tests;
        long[][] mine = {decided, ship, shipWorse, shipNotBetter, shipBest, pickBest, drew, stopAt, stopShip, stopKeep,
            stopShipWorse, stopShipNotBetter, stopShipBetter, stopShipBest, stopPickBest, acted};
        long[][] theirs = {t.decided, t.ship, t.shipWorse, t.shipNotBetter, t.shipBest, t.pickBest, t.drew, t.stopAt,
            t.stopShip, t.stopKeep, t.stopShipWorse, t.stopShipNotBetter, t.stopShipBetter, t.stopShipBest,
            t.stopPickBest, t.acted};
        for (int i = 0; i < mine.length; i++) {
            for (int j = 0; j < mine[i].length; j++) {
                mine[i][j] += theirs[i][j];
            }
        }
        double[][] mineD = {loss, regret, stopLoss, stopRegret, valueSum, liftSum, bestShare, baseSum};
        double[][] theirsD = {t.loss, t.regret, t.stopLoss, t.stopRegret, t.valueSum, t.liftSum, t.bestShare, t.baseSum};
        for (int i = 0; i < mineD.length; i++) {
            for (int j = 0; j < mineD[i].length; j++) {
                mineD[i][j] += theirsD[i][j];
            }
        }
    }

    private static double max(double[] x) {
        double m = x[0];
        for (double v : x) {
            m = Math.max(m, v);
        }
        return m;
    }
}
