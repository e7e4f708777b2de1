package dev.cairn.cli.serve;

import java.util.List;

/**
 * One route of the service: a method and a path template whose {@code {name}} segments match any one
 * segment. The OpenAPI description is checked against the list of these (see the service's tests).
 *
 * @param method   the HTTP method
 * @param template the path, e.g. {@code /v1/fits/{id}}
 */
record Route(String method, String template) {

    /** Every route the service answers, in the order the README lists them. */
    static final List<Route> ALL = List.of(
            new Route("POST", "/v1/fits"),
            new Route("GET", "/v1/fits/{id}"),
            new Route("DELETE", "/v1/fits/{id}"),
            new Route("GET", "/v1/schema"),
            new Route("GET", "/v1/health"),
            new Route("GET", "/v1/openapi.json"));

    /**
     * @param path a request's path
     * @return the value of the template's one variable segment ("" when it has none), or null when the path
     *         does not match
     */
    String match(String path) {
        String[] want = template.split("/", -1);
        String[] got = path.split("/", -1);
        if (want.length != got.length) {
            return null;
        }
        String variable = "";
        for (int i = 0; i < want.length; i++) {
            if (want[i].startsWith("{")) {
                if (got[i].isEmpty()) {
                    return null;
                }
                variable = got[i];
            } else if (!want[i].equals(got[i])) {
                return null;
            }
        }
        return variable;
    }
}
