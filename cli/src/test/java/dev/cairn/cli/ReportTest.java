package dev.cairn.cli;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import dev.cairn.cli.report.ReportWriter;
import dev.cairn.models.Cairn;
import dev.cairn.models.FitOptions;
import dev.cairn.models.FitOutcome;
import dev.cairn.models.ResultWriter;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The HTML report of every example spec: sections, plots, self-containment, and a real browser. */
class ReportTest {
    @TempDir
    static Path demo;

    /** Expected section ids per example (each must hold at least one plot). */
    static final Map<String, List<String>> SECTIONS = Map.of(
            "store-layout-arpu", List.of("arms", "comparisons", "checks", "diagnostics"),
            "store-layout-arpu-mcmc", List.of("arms", "comparisons", "checks", "diagnostics"),
            "store-layout-conversion", List.of("arms", "comparisons", "diagnostics"),
            "store-layout-by-region", List.of("arms", "comparisons", "segments", "diagnostics"),
            "region-lifts-pooled", List.of("effects", "diagnostics"),
            "retention-onboarding", List.of("retention", "diagnostics"));

    @BeforeAll
    static void runDemo() {
        String[] r = MainTest.run("demo", "--out", demo.toString(), "--quiet");
        assertEquals("0", r[0], r[2]);
    }

    @Test
    void everyExampleReportHasItsSectionsEachWithAPlot() throws IOException {
        assertTrue(Files.exists(demo.resolve("lantern-reef-users.csv")) && Files.exists(demo.resolve("lantern-reef-cohorts.csv")));
        for (Map.Entry<String, List<String>> e : SECTIONS.entrySet()) {
            assertTrue(Files.exists(demo.resolve(e.getKey()).resolve(ResultWriter.RESULT)), e.getKey());
            assertTrue(Files.exists(demo.resolve(e.getKey()).resolve(ResultWriter.DRAWS)), e.getKey());
            String html = Files.readString(demo.resolve(e.getKey()).resolve(ReportWriter.REPORT), StandardCharsets.UTF_8);
            assertTrue(html.startsWith("<!DOCTYPE html>"), e.getKey());
            assertTrue(html.contains("id=\"verdict\""), e.getKey() + ": verdict in the header");
            assertTrue(html.contains("not financial or legal advice"), e.getKey() + ": cautions in the header");
            for (String id : e.getValue()) {
                Matcher m = Pattern.compile("<section id=\"" + id + "\">(.*?)</section>", Pattern.DOTALL).matcher(html);
                assertTrue(m.find(), e.getKey() + ": section " + id);
                assertTrue(m.group(1).contains("<svg"), e.getKey() + ": a plot in section " + id);
            }
            // self-contained: no scripts, no remote or linked resources
            assertFalse(html.contains("<script"), e.getKey());
            assertFalse(html.contains("<link"), e.getKey());
            assertFalse(Pattern.compile("(src|href)=['\"]https?:").matcher(html).find(), e.getKey());
            assertFalse(html.contains("@import") || html.contains("url(http"), e.getKey());
        }
    }

    @Test
    void writingTheReportNeverChangesTheResult() throws IOException {
        Path spec = demo.resolve("store-layout-conversion.json");
        FitOutcome out = Cairn.fit(spec, FitOptions.DEFAULT);
        Path dir = demo.resolve("again");
        ResultWriter.write(out, dir);
        byte[] before = Files.readAllBytes(dir.resolve(ResultWriter.RESULT));
        ReportWriter.write(out, "store-layout-conversion.json", dir);
        assertArrayEquals(before, Files.readAllBytes(dir.resolve(ResultWriter.RESULT)));
        assertEquals(ResultWriter.json(out.result()), new String(before, StandardCharsets.UTF_8));
    }

    /** Headless Chromium with no network or first-run chatter, its own profile under the demo folder. */
    private static Process chromium(Path chromium, String profile, boolean mergeErrors, String... args) throws IOException {
        List<String> command = new java.util.ArrayList<>(List.of(chromium.toString(), "--headless", "--no-sandbox",
                "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking",
                "--disable-component-update", "--disable-sync", "--user-data-dir=" + demo.resolve(profile)));
        command.addAll(List.of(args));
        return new ProcessBuilder(command).redirectErrorStream(mergeErrors).start();
    }

    /**
     * End to end in headless Chromium (installed by .ci/run from the distribution's packages): the page
     * loads without console errors and renders a screenshot that is not blank.
     */
    @Test
    void aDemoReportRendersInHeadlessChromium() throws Exception {
        Path chromium = Path.of("/usr/bin/chromium");
        assumeTrue(Files.isExecutable(chromium), "Chromium is not installed here (.ci/run installs it from the "
                + "distribution's packages); skipping the browser test");
        Path shot = demo.resolve("shot.png");
        Path report = demo.resolve("store-layout-by-region").resolve(ReportWriter.REPORT);
        Process p = chromium(chromium, "chromium-profile", true, "--hide-scrollbars", "--enable-logging=stderr", "--v=0",
                "--window-size=1280,1600", "--screenshot=" + shot, report.toUri().toString());
        String log = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
        assertTrue(p.waitFor(120, TimeUnit.SECONDS), "chromium finished");
        assertTrue(Files.size(shot) > 10_000, "a screenshot was written: " + log);
        assertFalse(log.contains(":CONSOLE("), "no console messages from the page: " + log);
        BufferedImage image = ImageIO.read(shot.toFile());
        Set<Integer> colours = new HashSet<>();
        for (int y = 0; y < image.getHeight(); y += 7) {
            for (int x = 0; x < image.getWidth(); x += 7) {
                colours.add(image.getRGB(x, y));
            }
        }
        assertTrue(colours.size() > 20, "the screenshot is not blank: " + colours.size() + " colours");
    }

    /**
     * In headless Chromium, the DOM it renders for a report of demo data with duplicated user ids shows the
     * decision first in the main part, money in the spec's currency, and the data warning the terminal prints.
     */
    @Test
    void theRenderedReportLeadsWithTheDecisionAndCarriesUnitsAndWarnings() throws Exception {
        Path chromium = Path.of("/usr/bin/chromium");
        assumeTrue(Files.isExecutable(chromium), "Chromium is not installed here (.ci/run installs it from the "
                + "distribution's packages); skipping the browser test");
        Path dir = demo.resolve("duplicates");
        Files.createDirectories(dir);
        List<String> lines = Files.readAllLines(demo.resolve("lantern-reef-users.csv"), StandardCharsets.UTF_8);
        List<String> withRepeats = new java.util.ArrayList<>(lines);
        withRepeats.addAll(lines.subList(1, 51)); // 50 user ids twice
        Files.write(dir.resolve("users.csv"), withRepeats, StandardCharsets.UTF_8);
        Files.writeString(dir.resolve("spec.json"), """
                {"model": "spend", "currency": "EUR", "control": "A-current",
                 "data": {"path": "users.csv", "layout": "users",
                          "columns": {"arm": "store_variant", "spend": "spend_d7", "user": "user_id"}}}
                """);
        String[] r = MainTest.run("fit", dir.resolve("spec.json").toString(), "--out", dir.resolve("out").toString());
        assertEquals("0", r[0], r[2]);
        Process p = chromium(chromium, "chromium-profile-2", false, "--dump-dom",
                dir.resolve("out").resolve(ReportWriter.REPORT).toUri().toString());
        String dom = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
        assertTrue(p.waitFor(120, TimeUnit.SECONDS), "chromium finished");
        int main = dom.indexOf("<main>");
        assertTrue(main > 0, "rendered DOM has a main part");
        assertEquals(main + "<main>".length(), dom.indexOf("<section id=\"decision\">", main) - (dom.charAt(main + 6) == '\n' ? 1 : 0),
                "the decision is the first thing in main");
        Matcher decision = Pattern.compile("<p class=\"decision\">(.*?)</p>", Pattern.DOTALL).matcher(dom);
        assertTrue(decision.find() && decision.group(1).matches("(Ship|Keep the control|Keep collecting data).*"),
                "a plain outcome");
        assertTrue(decision.group(1).contains("EUR per user"), "the decision's money is in EUR: " + decision.group(1));
        Matcher warnings = Pattern.compile("<div class=\"warnings\" id=\"warnings\">(.*?)</div>", Pattern.DOTALL).matcher(dom);
        assertTrue(warnings.find(), "a warnings block in the report");
        assertTrue(warnings.group(1).contains("50") && warnings.group(1).toLowerCase(java.util.Locale.ROOT).contains("duplicate"),
                "the duplicate-id warning: " + warnings.group(1));
        assertTrue(r[1].contains("duplicate"), "the terminal says it too");
    }

    /**
     * With more segments than a page holds, the chart keeps the largest ones in order of size, the table keeps
     * every segment (largest first), and the lift axis is in percent.
     */
    @Test
    void segmentChartsStayReadableWithManySegments() throws IOException {
        Path dir = demo.resolve("many-segments");
        dev.cairn.models.demo.StudioScaleScenario.write(dir.resolve("cells.csv"), 60, 2, 5);
        Files.writeString(dir.resolve("spec.json"), """
                {"model": "segmented-spend", "currency": "EUR", "data": {"path": "cells.csv", "layout": "summary"}, "control": "A"}
                """);
        FitOutcome out = Cairn.fit(dir.resolve("spec.json"), FitOptions.DEFAULT);
        ReportWriter.write(out, "spec.json", dir);
        String html = Files.readString(dir.resolve(ReportWriter.REPORT), StandardCharsets.UTF_8);
        Matcher section = Pattern.compile("<section id=\"segments\">(.*?)</section>", Pattern.DOTALL).matcher(html);
        assertTrue(section.find());
        String seg = section.group(1);
        assertTrue(seg.contains("the 40 largest of 60 charted; every one is in the table"), "the cap is stated");
        assertTrue(seg.contains("lift by segment (%)"), "the lift chart is in percent");
        Matcher table = Pattern.compile("<table id=\"segment-table\">(.*?)</table>", Pattern.DOTALL).matcher(seg);
        assertTrue(table.find());
        Matcher rows = Pattern.compile("<tr><td>([^<]*)</td><td>([\\d,]+)</td>").matcher(table.group(1));
        List<Long> users = new java.util.ArrayList<>();
        while (rows.find()) {
            users.add(Long.parseLong(rows.group(2).replace(",", "")));
        }
        assertEquals(60, users.size(), "every segment in the table");
        for (int i = 1; i < users.size(); i++) {
            assertTrue(users.get(i) <= users.get(i - 1), "largest first: " + users);
        }
    }
}
