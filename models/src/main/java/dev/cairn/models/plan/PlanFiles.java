package dev.cairn.models.plan;

import dev.cairn.models.ResultWriter;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.util.Locale;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;

/** Writes a plan's plan.json and plan.csv (one row per look day), each atomically. */
public final class PlanFiles {
    public static final String JSON = "plan.json";
    public static final String CSV = "plan.csv";
    /** plan.csv's columns: the look day, the sequential rule cumulated to that day, then the fixed-horizon figures. */
    public static final String[] COLUMNS = {"day", "stopping_share", "stopped_share", "shipped_share",
        "shipped_worse_share", "shipped_best_share", "expected_loss_at_stop", "fixed_decided_share", "fixed_ship_share",
        "fixed_ship_worse_share", "fixed_ship_not_better_share", "fixed_ship_best_share", "fixed_pick_best_share",
        "fixed_expected_loss", "fixed_realised_loss", "fixed_draws_share"};

    private PlanFiles() {
    }

    /**
     * Writes plan.json and plan.csv into a folder.
     *
     * @param plan the plan's figures
     * @param dir  the folder
     * @throws UncheckedIOException when a file cannot be written
     */
    public static void write(PlanResult plan, Path dir) {
        try {
            ResultWriter.atomically(dir.resolve(JSON), w -> w.write(ResultWriter.jsonOf(plan) + "\n"));
            ResultWriter.atomically(dir.resolve(CSV), w -> csv(plan, w));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /**
     * plan.csv's text: a header, then one row per look day; numbers in shortest round-trip form.
     *
     * @param plan the figures
     * @param out  where to write
     * @throws IOException when writing fails
     */
    public static void csv(PlanResult plan, Appendable out) throws IOException {
        CSVPrinter csv = new CSVPrinter(out, CSVFormat.DEFAULT.builder().setRecordSeparator("\n").setHeader(COLUMNS).get());
        for (PlanResult.Day d : plan.days()) {
            PlanResult.Sequential s = d.sequential();
            PlanResult.Fixed f = d.fixed();
            csv.printRecord(d.day(), n(s.stoppingShare()), n(s.stoppedShare()), n(s.shipShare()), n(s.shipWorseShare()),
                    n(s.shipBestShare()), s.expectedLoss() == null ? "" : n(s.expectedLoss()), n(f.decidedShare()),
                    n(f.shipShare()), n(f.shipWorseShare()), n(f.shipNotBetterShare()), n(f.shipBestShare()),
                    n(f.pickBestShare()), n(f.expectedLoss()), n(f.realisedLoss()), n(f.drawsShare()));
        }
        csv.flush(); // not closed: the caller owns the writer
    }

    private static String n(double v) {
        return v == Math.rint(v) && Math.abs(v) < 1e15 ? String.format(Locale.ROOT, "%.0f", v) : Double.toString(v);
    }
}
