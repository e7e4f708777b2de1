package dev.cairn.models.result;

/** Where the data came from and how many rows and users it held; {@code query} is the SQL used. */
public record DataInfo(String source, String layout, long rows, long users, String query) {
}
