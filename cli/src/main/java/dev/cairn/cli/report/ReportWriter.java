package dev.cairn.cli.report;

import dev.cairn.models.FitOutcome;
import dev.cairn.models.ResultWriter;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Path;

/** Writes DIR/report.html next to result.json, atomically; it reads the outcome and never changes the result. */
public final class ReportWriter {
    public static final String REPORT = "report.html";

    private ReportWriter() {
    }

    public static Path write(FitOutcome outcome, String source, Path dir) {
        Path target = dir.resolve(REPORT);
        String html = HtmlReport.render(outcome, source);
        try {
            ResultWriter.atomically(target, w -> w.write(html));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return target;
    }
}
