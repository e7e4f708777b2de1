package dev.cairn.models.data;

import dev.cairn.models.InputException;
import dev.cairn.models.spec.DataSpec;
import java.util.ArrayList;
import java.util.List;

/** What every engine's users-layout reader says besides the statistics: warnings, and duplicate user ids. */
public final class UsersWarnings {
    private UsersWarnings() {
    }

    /**
     * The users layout's warnings, for any engine: no spend column (a conversion-only fit), or blank spend
     * cells read as 0.
     *
     * @param name   the data's name in messages
     * @param data   the spec's data part
     * @param spend  the spend column, or null when there is none
     * @param blanks blank spend cells read as 0
     * @return the warnings
     */
    public static List<String> usersWarnings(String name, DataSpec data, String spend, long blanks) {
        List<String> warnings = new ArrayList<>();
        if (spend == null) {
            warnings.add(conversionOnly(name + " has no spend column ('"
                    + data.column(SpendDataReader.SPEND, SpendDataReader.SPEND) + "')"));
        } else if (blanks > 0) {
            warnings.add(name + ", column '" + spend + "': " + blanks + " blank spend cell"
                    + (blanks == 1 ? "" : "s") + " read as 0 (data.missingSpend is \"zero\")");
        }
        return warnings;
    }

    /** Duplicate user ids: a warning, or refused when the spec is strict. */

    /**
     * Duplicate user ids, for any engine: a warning, or refused when the spec is strict.
     *
     * @param name       the data's name in messages
     * @param user       the user column
     * @param duplicates rows less distinct ids
     * @param strict     whether warnings are errors
     * @param warnings   receives the warning
     * @throws InputException when strict and there are duplicates
     */
    public static void duplicateUsers(String name, String user, long duplicates, boolean strict, List<String> warnings) {
        if (duplicates > 0) {
            String message = name + ", column '" + user + "': " + duplicates + " duplicate user id"
                    + (duplicates == 1 ? "" : "s") + " (each row is counted as one user)";
            if (strict) {
                throw new InputException(message + "; refused because the spec is strict");
            }
            warnings.add(message);
        }
    }

    /** The warning of a fit without spend: what it estimates and what it leaves out. */
    /**
     * The warning of a fit without spend.
     *
     * @param why what the data lack
     * @return the warning
     */
    public static String conversionOnly(String why) {
        return why + ": a conversion-only fit — payer rate alone; ARPU and ARPPU are not estimated";
    }
}
