package dev.cairn.models.spec;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.databind.JsonNode;
import java.util.List;
import java.util.Map;

/** Where the data are and how to read them: a file ({@code path}) or inline {@code rows}. */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record DataSpec(String path, String layout, Map<String, String> columns, List<JsonNode> rows) {

    /** The data column for a logical column, {@code columns.<name>} or the default name. */
    public String column(String logical, String defaultName) {
        if (columns != null && columns.get(logical) != null) {
            return columns.get(logical);
        }
        return defaultName;
    }

    public boolean mapped(String logical) {
        return columns != null && columns.containsKey(logical);
    }
}
