package dev.cairn.models.plan;

import com.fasterxml.jackson.databind.JsonNode;
import com.networknt.schema.JsonSchema;
import dev.cairn.models.InputException;
import dev.cairn.models.prior.Beta;
import dev.cairn.models.prior.NormalInverseGamma;
import dev.cairn.models.result.Metric;
import dev.cairn.models.spec.SpecReader;
import dev.cairn.models.spend.HistoryPriors;
import dev.cairn.models.spend.SpendPriors;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.DrawsCsv;
import java.io.IOException;
import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Locale;

/**
 * Reads a plan spec: JSON, then its JSON Schema ({@code cairn schema --plan}), then the rules across fields a
 * schema cannot say; files it names (history, a previous result) are read relative to the spec's folder.
 * Every failure is an {@link InputException} with one line naming the field or file.
 */
public final class PlanReader {
    private static final String RESOURCE = "/dev/cairn/models/plan/plan.schema.json";
    private static final JsonNode SCHEMA_TREE = SpecReader.tree(schemaText(), RESOURCE);
    private static final JsonSchema SCHEMA = SpecReader.compile(SCHEMA_TREE);
    /** Most simulated tests x looks a plan may ask for (each look's figures are kept per test in passing). */
    public static final long MAX_LOOKS = 20_000_000L;

    private PlanReader() {
    }

    /** {@return the plan spec's JSON Schema (draft 2020-12), as bundled in the jar} */
    public static String schemaText() {
        return dev.cairn.models.spec.SpecSchema.resourceText(RESOURCE);
    }

    /**
     * Reads and validates a plan spec file.
     *
     * @param file the plan spec
     * @return the plan
     * @throws InputException one line naming the file and the field
     */
    public static PlanSpec read(Path file) {
        Path base = file.toAbsolutePath().getParent();
        return parse(SpecReader.readText(file, "a plan spec JSON file"), file.toString(), base);
    }

    /**
     * Parses and validates plan spec text.
     *
     * @param text    the JSON text
     * @param origin  its name, for messages
     * @param baseDir the folder that relative paths in it start from
     * @return the plan
     * @throws InputException one line naming the field
     */
    public static PlanSpec parse(String text, String origin, Path baseDir) {
        JsonNode tree = SpecReader.tree(text, origin);
        SpecReader.validate(SCHEMA_TREE, SCHEMA, tree, origin);
        List<String> arms = new ArrayList<>();
        tree.get("arms").fieldNames().forEachRemaining(arms::add);
        String controlName = tree.get("control").asText();
        int control = arms.indexOf(controlName);
        if (control < 0) {
            throw new InputException(origin + ": /control: '" + controlName + "' is not one of the arms " + arms);
        }
        long[] users = usersPerDay(tree.get("usersPerDay"), arms, origin);
        Baseline baseline = baseline(tree.get("baseline"), origin, baseDir);
        JsonNode decision = tree.path("decision");
        Metric metric = Metric.of(decision.path("metric").asText(baseline.hasSpend() ? "arpu" : "payerRate"));
        if (metric != Metric.PAYER_RATE && !baseline.hasSpend()) {
            throw new InputException(origin + ": /decision/metric: '" + metric.key() + "' needs spend in the baseline "
                    + "(logSpendMean and logSpendSd, priors.logSpend, or a result with spend); this baseline has a payer rate only");
        }
        LookRule.Kind rule = decision.path("rule").asText("expected-loss").equals("prob-above")
                ? LookRule.Kind.PROB_ABOVE : LookRule.Kind.EXPECTED_LOSS;
        if (rule == LookRule.Kind.PROB_ABOVE && decision.has("tolerance")) {
            throw new InputException(origin + ": /decision/tolerance: applies to rule 'expected-loss'; rule 'prob-above' "
                    + "ships on /decision/threshold");
        }
        if (rule == LookRule.Kind.EXPECTED_LOSS && decision.has("threshold")) {
            throw new InputException(origin + ": /decision/threshold: applies to rule 'prob-above'; rule 'expected-loss' "
                    + "acts on /decision/tolerance");
        }
        Double tolerance = decision.has("tolerance") ? decision.get("tolerance").asDouble() : null;
        double threshold = decision.path("threshold").asDouble(0.95);
        JsonNode schedule = tree.path("schedule");
        int maxDays = schedule.path("maxDays").asInt(28);
        int minDays = schedule.path("minDays").asInt(Math.min(7, maxDays));
        int lookEvery = schedule.path("lookEvery").asInt(1);
        if (minDays > maxDays) {
            throw new InputException(origin + ": /schedule/minDays: " + minDays + " is after maxDays " + maxDays);
        }
        Lift[] payer = new Lift[arms.size()];
        Lift[] arppu = new Lift[arms.size()];
        for (int k = 0; k < arms.size(); k++) {
            JsonNode arm = tree.get("arms").get(arms.get(k));
            String at = "/arms/" + pointerPart(arms.get(k));
            payer[k] = lift(arm.get("payerRateLift"), origin, at + "/payerRateLift");
            arppu[k] = lift(arm.get("arppuLift"), origin, at + "/arppuLift");
            if (arm.has("arppuLift") && !baseline.hasSpend()) {
                throw new InputException(origin + ": " + at + "/arppuLift: the baseline has no spend to change");
            }
            if (baseline instanceof Baseline.Fixed f && payer[k].fixed() && f.payerRate() * (1 + payer[k].first()) > 1) {
                throw new InputException(origin + ": " + at + "/payerRateLift: takes the payer rate "
                        + f.payerRate() + " above 1");
            }
        }
        JsonNode priors = tree.path("priors");
        Beta payerPrior = priors.has("payerRate") ? beta(priors.get("payerRate")) : SpendPriors.DEFAULT_PAYER_RATE;
        NormalInverseGamma spendPrior = priors.has("logSpend") ? nig(priors.get("logSpend")) : SpendPriors.DEFAULT_LOG_SPEND;
        JsonNode simulation = tree.path("simulation");
        int experiments = simulation.path("experiments").asInt(10_000);
        int looks = (maxDays - minDays) / lookEvery + 2;
        if ((long) experiments * looks > MAX_LOOKS) {
            throw new InputException(String.format(Locale.ROOT, "%s: /simulation/experiments: %,d tests x %d looks is "
                    + "more than %,d looks; simulate fewer tests or look less often", origin, experiments, looks, MAX_LOOKS));
        }
        String currency = tree.has("currency") ? tree.get("currency").asText() : null;
        if (currency != null) {
            try {
                java.util.Currency.getInstance(currency);
            } catch (IllegalArgumentException e) {
                throw new InputException(origin + ": /currency: '" + currency + "' is not an ISO 4217 currency code");
            }
        }
        return new PlanSpec(tree.has("title") ? tree.get("title").asText() : null, List.copyOf(arms), control, users,
                baseline, payer, arppu, payerPrior, spendPrior, metric, rule, tolerance, threshold, minDays, maxDays,
                lookEvery, experiments, simulation.path("seed").asLong(1), !simulation.path("method").asText("approximate")
                .equals("draws"), simulation.path("draws").asInt(4000), currency);
    }

    /** An arm's name as one step of a JSON pointer (RFC 6901: ~ as ~0, / as ~1). */
    private static String pointerPart(String name) {
        return name.replace("~", "~0").replace("/", "~1");
    }

    private static long[] usersPerDay(JsonNode node, List<String> arms, String origin) {
        long[] users = new long[arms.size()];
        if (node.isNumber()) {
            java.util.Arrays.fill(users, node.asLong());
            return users;
        }
        for (Iterator<String> it = node.fieldNames(); it.hasNext(); ) {
            String name = it.next();
            if (!arms.contains(name)) {
                throw new InputException(origin + ": /usersPerDay/" + pointerPart(name) + ": not one of the arms " + arms);
            }
        }
        for (int k = 0; k < arms.size(); k++) {
            if (!node.has(arms.get(k))) {
                throw new InputException(origin + ": /usersPerDay: no number for arm '" + arms.get(k)
                        + "' (give every arm, or one number for all)");
            }
            users[k] = node.get(arms.get(k)).asLong();
        }
        return users;
    }

    private static Lift lift(JsonNode node, String origin, String at) {
        if (node == null) {
            return Lift.NONE;
        }
        if (node.isNumber()) {
            return new Lift("fixed", node.asDouble(), 0);
        }
        String family = node.get("family").asText();
        if (family.equals("uniform")) {
            double lower = node.get("lower").asDouble(), upper = node.get("upper").asDouble();
            if (!(lower < upper)) {
                throw new InputException(origin + ": " + at + "/upper: " + upper + " must be above lower " + lower);
            }
            return new Lift("uniform", lower, upper);
        }
        double mean = node.get("mean").asDouble(), sd = node.get("sd").asDouble();
        if ((-1 - mean) / sd > 3) {
            throw new InputException(origin + ": " + at + ": a normal of mean " + mean + " and sd " + sd
                    + " puts almost all its lifts below -1 (a metric cannot fall by more than 100%)");
        }
        return new Lift("normal", mean, sd);
    }

    private static Beta beta(JsonNode node) {
        return new Beta(node.get("a").asDouble(), node.get("b").asDouble());
    }

    private static NormalInverseGamma nig(JsonNode node) {
        return new NormalInverseGamma(node.get("mu0").asDouble(), node.get("kappa0").asDouble(),
                node.get("alpha0").asDouble(), node.get("beta0").asDouble());
    }

    private static Baseline baseline(JsonNode node, String origin, Path baseDir) {
        List<String> forms = new ArrayList<>();
        for (String form : new String[] {"priors", "fromHistory", "fromResult"}) {
            if (node.has(form)) {
                forms.add(form);
            }
        }
        boolean numbers = node.has("payerRate") || node.has("logSpendMean") || node.has("logSpendSd");
        if (forms.size() + (numbers ? 1 : 0) != 1) {
            throw new InputException(origin + ": /baseline: give exactly one of fixed numbers (payerRate, logSpendMean, "
                    + "logSpendSd), 'priors', 'fromHistory' or 'fromResult'" + (forms.isEmpty() && !numbers ? ""
                    : "; found " + (numbers ? "numbers" + (forms.isEmpty() ? "" : " and ") : "") + String.join(" and ", forms)));
        }
        if (numbers) {
            if (!node.has("payerRate")) {
                throw new InputException(origin + ": /baseline/payerRate: required key is missing");
            }
            if (node.has("logSpendMean") != node.has("logSpendSd")) {
                throw new InputException(origin + ": /baseline/" + (node.has("logSpendMean") ? "logSpendSd" : "logSpendMean")
                        + ": give logSpendMean and logSpendSd together (or neither, for a payer rate only)");
            }
            return new Baseline.Fixed(node.get("payerRate").asDouble(),
                    node.has("logSpendMean") ? node.get("logSpendMean").asDouble() : Double.NaN,
                    node.has("logSpendSd") ? node.get("logSpendSd").asDouble() : Double.NaN);
        }
        if (node.has("priors")) {
            JsonNode p = node.get("priors");
            return new Baseline.Drawn(beta(p.get("payerRate")), p.has("logSpend") ? nig(p.get("logSpend")) : null,
                    "priors", null);
        }
        if (node.has("fromHistory")) {
            String path = node.get("fromHistory").get("path").asText();
            SpendPriors fitted;
            try {
                fitted = HistoryPriors.fit(path, baseDir);
            } catch (InputException e) {
                throw new InputException(origin + ": /baseline/fromHistory: " + e.getMessage());
            }
            return new Baseline.Drawn(fitted.payerRate(), fitted.logSpend(), "history", fitted.note());
        }
        JsonNode from = node.get("fromResult");
        return fromResult(from.get("path").asText(), from.has("arm") ? from.get("arm").asText() : null, origin, baseDir);
    }

    /** A previous spend fit's posterior draws of one arm: result.json names the model and arms, draws.csv has the draws. */
    private static Baseline fromResult(String path, String arm, String origin, Path baseDir) {
        String at = origin + ": /baseline/fromResult/path: " + path;
        Path file = baseDir.resolve(path);
        JsonNode result;
        try {
            result = SpecReader.tree(Files.readString(file, StandardCharsets.UTF_8), path);
        } catch (NoSuchFileException e) {
            throw new InputException(at + ": no such file");
        } catch (IOException e) {
            throw new InputException(at + ": cannot be read (" + e.getMessage() + ")");
        } catch (InputException e) {
            throw new InputException(origin + ": /baseline/fromResult/path: " + e.getMessage());
        }
        if (!"spend".equals(result.path("model").asText())) {
            throw new InputException(at + ": is not a result of model 'spend' (model '" + result.path("model").asText()
                    + "'); give the result.json of a spend fit");
        }
        String chosen = arm != null ? arm : result.path("control").asText();
        if (!result.path("arms").has(chosen)) {
            List<String> names = new ArrayList<>();
            result.path("arms").fieldNames().forEachRemaining(names::add);
            throw new InputException(origin + ": /baseline/fromResult/arm: '" + chosen + "' is not an arm of " + path
                    + " " + names);
        }
        if (!result.path("converged").asBoolean(false)) {
            throw new InputException(at + ": that fit did not converge; its draws are not a posterior to plan from");
        }
        Path drawsFile = file.resolveSibling(dev.cairn.models.ResultWriter.DRAWS);
        Draws draws;
        try (Reader in = Files.newBufferedReader(drawsFile, StandardCharsets.UTF_8)) {
            draws = DrawsCsv.read(in);
        } catch (NoSuchFileException e) {
            throw new InputException(at + ": needs the fit's draws.csv beside it (" + drawsFile + " is missing)");
        } catch (IOException e) {
            throw new InputException(at + ": cannot read " + drawsFile + " (" + e.getMessage() + ")");
        } catch (DrawsCsv.FormatException e) {
            throw new InputException(at + ": " + drawsFile + ": line " + e.line() + ": " + e.getMessage());
        }
        String rate = "payerRate[" + chosen + "]", mean = "logSpendMean[" + chosen + "]", sd = "logSpendSd[" + chosen + "]";
        if (!draws.has(rate)) {
            throw new InputException(at + ": " + drawsFile + " has no column " + rate);
        }
        double[] p = draws.pooled(rate);
        boolean spend = draws.has(mean) && draws.has(sd);
        double[] m = spend ? draws.pooled(mean) : null, s = spend ? draws.pooled(sd) : null;
        double[][] rows = new double[p.length][];
        for (int i = 0; i < p.length; i++) {
            rows[i] = new double[] {p[i], spend ? m[i] : Double.NaN, spend ? s[i] : Double.NaN};
        }
        return new Baseline.Posterior(rows, path, chosen);
    }
}
