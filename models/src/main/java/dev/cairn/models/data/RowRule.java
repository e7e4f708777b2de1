package dev.cairn.models.data;

import com.fasterxml.jackson.databind.JsonNode;
import dev.cairn.models.InputException;
import java.util.ArrayList;
import java.util.List;
import java.util.function.Predicate;

/**
 * A row rule in both forms, the engine's SQL condition and the same test in Java (for inline rows read
 * without the engine), with the column it names and what is wrong. A layout keeps its rules in one list, so
 * the two paths check the same things, in the same order, with the same words. Java forms follow SQL's rule
 * that a comparison with NULL is not true.
 *
 * @param sql    the condition a bad row meets, in the engine's SQL
 * @param test   the same condition on a row's values read in Java
 * @param column the column (or columns, joined by "/") the message names
 * @param what   what is wrong
 * @param <R>    a layout's row of values
 */
record RowRule<R>(String sql, Predicate<R> test, String column, String what) {

    /**
     * The rules in the form {@link Source#check} runs them.
     *
     * @param rules a layout's rules
     * @param <R>   its row type
     * @return {condition, column, message} per rule
     */
    static <R> String[][] sqlForms(List<RowRule<R>> rules) {
        String[][] out = new String[rules.size()][];
        for (int i = 0; i < rules.size(); i++) {
            out[i] = new String[] {rules.get(i).sql(), rules.get(i).column(), rules.get(i).what()};
        }
        return out;
    }

    /**
     * Runs the rules in order over inline rows; the first that any row breaks is refused naming up to three
     * rows by JSON pointer, as the engine's path names them.
     *
     * @param rows  the rows' values, in the spec's order
     * @param rules the layout's rules
     * @param <R>   the row type
     * @throws InputException naming the rows, the column and what is wrong
     */
    static <R> void checkInline(List<R> rows, List<RowRule<R>> rules) {
        for (RowRule<R> rule : rules) {
            List<String> where = new ArrayList<>();
            long count = 0;
            for (int i = 0; i < rows.size(); i++) {
                if (rule.test().test(rows.get(i))) {
                    count++;
                    if (where.size() < 3) {
                        where.add("/data/rows/" + i);
                    }
                }
            }
            if (count > 0) {
                throw new InputException("spec: " + String.join(", ", where)
                        + (count > where.size() ? " and " + (count - where.size()) + " more" : "") + ", '" + rule.column()
                        + "': " + rule.what());
            }
        }
    }

    /** {@return a text value as the engine casts and trims it (spaces only); null when absent} */
    static String text(JsonNode v) {
        if (v == null || v.isNull()) {
            return null;
        }
        String t = v.asText();
        int from = 0, to = t.length();
        while (from < to && t.charAt(from) == ' ') {
            from++;
        }
        while (to > from && t.charAt(to - 1) == ' ') {
            to--;
        }
        return t.substring(from, to);
    }

    /** {@return a number value as a double; null when absent} */
    static Double number(JsonNode v) {
        return v == null || v.isNull() ? null : v.doubleValue();
    }
}
