package dev.cairn.spark;

import dev.cairn.models.Cairn;
import dev.cairn.models.FitOptions;
import dev.cairn.models.FitOutcome;
import dev.cairn.models.InputException;
import dev.cairn.models.ResultWriter;
import dev.cairn.models.spec.Spec;
import dev.cairn.models.spec.SpecReader;
import java.nio.file.Path;
import org.apache.spark.sql.SparkSession;

/**
 * cairn as a Spark job: {@code spark-submit --class dev.cairn.spark.CairnSparkJob cairn-spark-job.jar SPEC.json
 * --out DIR}. The spec's {@code data.engine} must be {@code "spark"}; Spark computes the statistics on the
 * cluster, and the driver fits and writes DIR/result.json and DIR/draws.csv (on the driver's file system) exactly
 * as {@code cairn fit} does. Exit codes as the command line's: 0 converged, 2 bad input (one line on standard
 * error), 3 not converged, 1 internal error.
 */
public final class CairnSparkJob {
    private CairnSparkJob() {
    }

    /**
     * Runs the job.
     *
     * @param args SPEC.json --out DIR
     */
    public static void main(String[] args) {
        System.exit(run(args));
    }

    /**
     * Runs the job in a running (or a new) Spark session.
     *
     * @param args SPEC.json --out DIR
     * @return the exit code
     */
    public static int run(String[] args) {
        if (args.length != 3 || !args[1].equals("--out")) {
            System.err.println("usage: spark-submit --class dev.cairn.spark.CairnSparkJob cairn-spark-job.jar SPEC.json --out DIR");
            return 2;
        }
        Path specFile = Path.of(args[0]);
        Path out = Path.of(args[2]);
        SparkSession session = SparkSession.builder().appName("cairn " + specFile.getFileName()).getOrCreate();
        try {
            Spec spec = SpecReader.read(specFile);
            if (!"spark".equals(spec.data().engine())) {
                throw new InputException(specFile + ": /data/engine: this job computes the statistics with Spark; set "
                        + "\"engine\": \"spark\" in data (or fit with cairn fit on one machine)");
            }
            FitOutcome outcome = Cairn.fit(spec, specFile.toAbsolutePath().getParent(), FitOptions.DEFAULT);
            java.nio.file.Files.createDirectories(out);
            ResultWriter.write(outcome, out);
            System.out.println("Wrote " + out.resolve(ResultWriter.RESULT) + " and " + out.resolve(ResultWriter.DRAWS));
            return outcome.result().converged() ? 0 : 3;
        } catch (InputException e) {
            System.err.println("cairn spark job: " + e.getMessage());
            return 2;
        } catch (java.io.IOException e) {
            System.err.println("cairn spark job: cannot write into " + out + " (" + e.getMessage() + ")");
            return 2;
        } finally {
            if (session.sparkContext().appName().startsWith("cairn ")) {
                session.stop();
            }
        }
    }
}
