package dev.cairn.models.retention;

import static org.junit.jupiter.api.Assertions.assertEquals;

import dev.cairn.models.Cairn;
import dev.cairn.models.FitOptions;
import dev.cairn.models.ResultWriter;
import dev.cairn.models.result.RetentionResult;
import dev.cairn.models.spec.SpecReader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.LocalDate;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.TreeMap;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** A retention fit from raw activity rows equals the fit of the same data counted into a cohort-days table. */
class ActivityFitTest {
    @TempDir
    Path dir;

    @Test
    void activityRowsFitAsTheirCohortDaysTable() throws Exception {
        SplittableRandom rng = new SplittableRandom(8);
        LocalDate start = LocalDate.of(2026, 1, 5);
        int cohorts = 12;
        LocalDate asOf = start.plusDays(cohorts + 13);
        StringBuilder activity = new StringBuilder("user_id,variant,install_date,active_date\n");
        // (cohort, arm) -> installs, and day -> active users, counted here as the rows are written
        Map<String, long[]> installs = new TreeMap<>();
        Map<String, Map<Integer, Long>> active = new TreeMap<>();
        int id = 0;
        for (int c = 0; c < cohorts; c++) {
            LocalDate day0 = start.plusDays(c);
            for (String arm : new String[] {"A", "B"}) {
                String key = day0 + "," + arm;
                for (int u = 0; u < 150; u++) {
                    String user = "p" + id++;
                    activity.append(user).append(',').append(arm).append(',').append(day0).append(',').append(day0).append('\n');
                    installs.computeIfAbsent(key, k -> new long[1])[0]++;
                    for (int t = 1; !day0.plusDays(t).isAfter(asOf); t++) {
                        double r = (arm.equals("A") ? 0.40 : 0.45) / Math.sqrt(1 + t);
                        if (rng.nextDouble() < r) {
                            activity.append(user).append(',').append(arm).append(',').append(day0).append(',')
                                    .append(day0.plusDays(t)).append('\n');
                            active.computeIfAbsent(key, k -> new TreeMap<>()).merge(t, 1L, Long::sum);
                        }
                    }
                }
            }
        }
        Files.writeString(dir.resolve("activity.csv"), activity);
        StringBuilder table = new StringBuilder("cohort,arm,day,installs,active\n");
        for (Map.Entry<String, long[]> e : installs.entrySet()) {
            LocalDate day0 = LocalDate.parse(e.getKey().substring(0, 10));
            int age = (int) java.time.temporal.ChronoUnit.DAYS.between(day0, asOf);
            for (int t = 1; t <= age; t++) {
                table.append(e.getKey()).append(',').append(t).append(',').append(e.getValue()[0]).append(',')
                        .append(active.getOrDefault(e.getKey(), Map.of()).getOrDefault(t, 0L)).append('\n');
            }
        }
        Files.writeString(dir.resolve("cohorts.csv"), table);
        String spec = """
            {"model": "retention", "curve": "activity", "control": "A", "days": [1, 7],
             "data": %s, "sampler": {"chains": 2, "warmup": 300, "draws": 300, "seed": 4}}
            """;
        RetentionResult fromActivity = (RetentionResult) Cairn.fit(SpecReader.parse(spec.formatted("""
            {"path": "activity.csv", "layout": "activity", "columns": {"user": "user_id", "arm": "variant",
             "installDate": "install_date", "activeDate": "active_date"}}"""), "spec.json"), dir, FitOptions.DEFAULT).result();
        RetentionResult fromTable = (RetentionResult) Cairn.fit(SpecReader.parse(spec.formatted("""
            {"path": "cohorts.csv", "layout": "cohort-days"}"""), "spec.json"), dir, FitOptions.DEFAULT).result();
        assertEquals(ResultWriter.jsonOf(fromTable.arms()), ResultWriter.jsonOf(fromActivity.arms()));
        assertEquals(ResultWriter.jsonOf(fromTable.comparisons()), ResultWriter.jsonOf(fromActivity.comparisons()));
    }
}
