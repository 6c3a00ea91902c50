package org.risetrace.web;

/** A refused request: an HTTP status and one line for the user, sent as {@code {"error": "..."}}. */
final class WebError extends RuntimeException {
    private final int status;

    WebError(int status, String message) {
        super(message, null, false, false);
        this.status = status;
    }

    int status() { return status; }

    static WebError badRequest(String message) { return new WebError(400, message); }

    static WebError notFound(String message) { return new WebError(404, message); }

    static WebError forbidden(String message) { return new WebError(403, message); }
}
