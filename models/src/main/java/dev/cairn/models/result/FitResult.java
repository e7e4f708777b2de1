package dev.cairn.models.result;

import java.util.List;

/** What every model's result has: the model, the verdict, warnings and the cautions shown with it. */
public sealed interface FitResult permits Result, PooledResult, RetentionResult {
    String model();

    String title();

    boolean converged();

    DataInfo data();

    DiagnosticsSummary diagnostics();

    Run run();

    List<String> warnings();

    List<String> cautions();
}
