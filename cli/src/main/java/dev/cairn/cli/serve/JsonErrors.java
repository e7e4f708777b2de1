package dev.cairn.cli.serve;

import java.nio.ByteBuffer;
import java.util.Locale;
import org.eclipse.jetty.http.HttpFields;
import org.eclipse.jetty.http.HttpHeader;
import org.eclipse.jetty.http.HttpStatus;
import org.eclipse.jetty.server.Request;
import org.eclipse.jetty.server.Response;
import org.eclipse.jetty.server.handler.ErrorHandler;
import org.eclipse.jetty.util.Callback;

/**
 * The errors the server itself raises (a malformed request line, headers too large, a handler that threw)
 * in the service's own JSON form, never an HTML page or a stack trace.
 */
final class JsonErrors extends ErrorHandler {

    @Override
    protected void generateResponse(Request request, Response response, int code, String message, Throwable cause,
                                    Callback callback) {
        response.getHeaders().put(HttpHeader.CONTENT_TYPE, "application/json");
        response.write(true, ByteBuffer.wrap(ErrorBody.of(code, text(code, message, cause))), callback);
    }

    @Override
    public ByteBuffer badMessageError(int status, String reason, HttpFields.Mutable fields) {
        fields.put(HttpHeader.CONTENT_TYPE, "application/json");
        return ByteBuffer.wrap(ErrorBody.of(status, text(status, reason, null)));
    }

    private static String text(int code, String message, Throwable cause) {
        if (code >= 500) { // say what, not where inside the server
            return code == 500 ? "internal error" + (cause == null ? "" : ": " + cause.getClass().getSimpleName())
                    : HttpStatus.getMessage(code);
        }
        String reason = message == null || message.isBlank() ? HttpStatus.getMessage(code) : message;
        return String.format(Locale.ROOT, "bad request: %s", reason.replaceAll("[\\r\\n]+", " "));
    }
}
