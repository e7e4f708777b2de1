package dev.cairn.models.data;

import com.fasterxml.jackson.databind.JsonNode;
import dev.cairn.models.InputException;
import dev.cairn.models.spec.DataSpec;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;

/**
 * The users layout from inline rows without the SQL engine (per-user values handed over in memory): the same
 * column checks, the same row checks in the same order with the same messages, and the same statistics as
 * {@link SpendDataReader#usersQuery}: per cell the users, the payers, and over the payers' spend the exact
 * sums of log spend, of its square and of spend ({@link ExactSums}), the extremes and
 * the p50/p90/p99 order statistics. The parity test compares both paths on valid and broken tables.
 */
final class UsersInline {
    private UsersInline() {
    }

    /** One row: arm and segment trimmed of spaces, the spend or the conversion (null when blank). */
    private record Row(String arm, String segment, Double spend, Boolean converted, String user) {
    }

    static SpendDataReader.Cells read(DataSpec data, boolean strict, boolean segmented) {
        Source source = Source.inlineColumns(data, c -> SpendDataReader.typeOf(c, data));
        String segment = segmented ? source.require(data, SpendDataReader.SEGMENT, SpendDataReader.SEGMENT) : null;
        String arm = source.require(data, SpendDataReader.ARM, SpendDataReader.ARM);
        String spend = source.optional(data, SpendDataReader.SPEND, SpendDataReader.SPEND);
        String converted = spend == null ? source.optional(data, SpendDataReader.CONVERTED, SpendDataReader.CONVERTED) : null;
        if (spend == null && converted == null) {
            throw new InputException(source.name + ": needs a spend column ('" + data.column(SpendDataReader.SPEND,
                    SpendDataReader.SPEND) + "', set data.columns.spend) or a 0/1 conversion column ('"
                    + data.column(SpendDataReader.CONVERTED, SpendDataReader.CONVERTED)
                    + "', set data.columns.converted); columns found: " + source.found());
        }
        String user = source.optionalMapped(data, "user");
        List<Row> rows = new ArrayList<>(data.rows().size());
        for (JsonNode r : data.rows()) {
            JsonNode c = converted == null ? null : r.get(converted);
            JsonNode u = user == null ? null : r.get(user);
            rows.add(new Row(RowRule.text(r.get(arm)), segment == null ? null : RowRule.text(r.get(segment)),
                    spend == null ? null : RowRule.number(r.get(spend)),
                    c == null || c.isNull() ? null : c.isBoolean() ? c.booleanValue() : c.intValue() == 1,
                    u == null || u.isNull() ? null : u.asText()));
        }
        if (rows.isEmpty()) {
            throw new InputException(source.name + ": no data rows");
        }
        RowRule.checkInline(rows, rules(data, arm, segment, spend, converted));
        TreeMap<List<String>, List<Row>> cells = new TreeMap<>((x, y) -> {
            int k = x.get(0).compareTo(y.get(0));
            return k != 0 ? k : x.get(1).compareTo(y.get(1));
        });
        long blanks = 0;
        for (Row r : rows) {
            cells.computeIfAbsent(List.of(r.segment() == null ? "" : r.segment(), r.arm()), k -> new ArrayList<>()).add(r);
            blanks += spend != null && r.spend() == null ? 1 : 0;
        }
        List<String> segments = new ArrayList<>();
        List<ArmStats> arms = new ArrayList<>();
        for (Map.Entry<List<String>, List<Row>> e : cells.entrySet()) {
            segments.add(segment == null ? null : e.getKey().get(0));
            arms.add(spend != null ? spendStats(e.getKey().get(1), e.getValue())
                    : ArmStats.conversions(e.getKey().get(1), e.getValue().size(),
                            e.getValue().stream().filter(r -> Boolean.TRUE.equals(r.converted())).count()));
        }
        List<String> warnings = UsersWarnings.usersWarnings(source.name, data, spend, blanks);
        if (user != null) {
            Set<String> distinct = new HashSet<>();
            for (Row r : rows) {
                if (r.user() != null) {
                    distinct.add(r.user());
                }
            }
            UsersWarnings.duplicateUsers(source.name, user, rows.size() - distinct.size(), strict, warnings);
        }
        return new SpendDataReader.Cells(segments, arms, spend != null, source.name, rows.size(), warnings, null);
    }

    /**
     * The users layout's row checks, in the order the engine's path makes them (there from the per-arm
     * aggregates, so the rules have only their Java form here).
     */
    private static List<RowRule<Row>> rules(DataSpec data, String arm, String segment, String spend, String converted) {
        double small = SpendDataReader.SMALLEST_SPEND, large = SpendDataReader.LARGEST_SPEND;
        boolean blankIsZero = spend != null && data.blankSpendIsZero();
        String value = spend != null ? spend : converted;
        return List.of(
            new RowRule<Row>(null, r -> r.arm() == null || r.arm().isEmpty(), arm, "arm is empty"),
            new RowRule<Row>(null, r -> segment != null && (r.segment() == null || r.segment().isEmpty()), segment,
                "segment is empty"),
            new RowRule<Row>(null, r -> !blankIsZero && (spend != null ? r.spend() == null : r.converted() == null), value,
                spend == null ? "value is empty"
                    : "spend is empty (if a blank means the user did not pay, set data.missingSpend to \"zero\")"),
            new RowRule<Row>(null, r -> r.spend() != null && !Double.isFinite(r.spend()), value,
                "spend must be a finite number (NaN or infinity found)"),
            new RowRule<Row>(null, r -> r.spend() != null && r.spend() < 0, value,
                "spend must be >= 0 (0 for users who did not pay)"),
            new RowRule<Row>(null, r -> r.spend() != null && r.spend() > 0 && (r.spend() < small || r.spend() > large), value,
                "a positive spend must lie between " + small + " and " + large + " (the model works with log spend and "
                    + "its square; rescale the currency unit)"));
    }

    /** One cell's statistics, as {@link SpendDataReader#usersQuery} computes them. */
    private static ArmStats spendStats(String arm, List<Row> rows) {
        long present = 0;
        double[] nonzero = new double[rows.size()];
        int k = 0;
        for (Row r : rows) {
            if (r.spend() != null) {
                present++;
                if (r.spend() != 0) {
                    nonzero[k++] = r.spend();
                }
            }
        }
        nonzero = Arrays.copyOf(nonzero, k);
        Arrays.sort(nonzero);
        double[] paid = Arrays.stream(nonzero).filter(y -> y > 0).toArray();
        ExactSums.PayerSums sums = new ExactSums.PayerSums();
        for (double y : paid) {
            sums.add(y);
        }
        double max = present == 0 ? Double.NaN // every cell blank: no extreme, as the engine's NULL reads
                : k == 0 ? 0 : present > k ? Math.max(nonzero[k - 1], 0) : nonzero[k - 1];
        return new ArmStats(arm, rows.size(), paid.length, sums.logSum(), sums.logSqSum(), sums.spendSum(),
                order(paid, 0.5), order(paid, 0.9),
                order(paid, 0.99), max);
    }

    /** The k-th smallest payer spend, k = floor(q (m - 1)) + 1 of m payers; NaN without payers. */
    private static double order(double[] paid, double q) {
        return paid.length == 0 ? Double.NaN : paid[(int) Math.floor(q * (paid.length - 1))];
    }
}
