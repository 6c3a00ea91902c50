package org.risetrace.web;

import com.sun.net.httpserver.HttpExchange;

import java.io.IOException;
import java.io.InputStream;
import java.util.Map;

/** The pages, served from the jar: a fixed list of names, so no request path ever reaches the file system. */
final class Static {
    private static final Map<String, String> FILES = Map.of(
            "/", "index.html",
            "/index.html", "index.html",
            "/app.js", "app.js",
            "/app.css", "app.css");

    private Static() { }

    static void serve(HttpExchange ex, String path) throws IOException {
        String name = FILES.get(path);
        if (name == null) throw WebError.notFound("no page " + path.replaceAll("[^\\x20-\\x7e]", "?"));
        byte[] body;
        try (InputStream in = Static.class.getResourceAsStream(name)) {
            if (in == null) throw new IllegalStateException("resource " + name + " missing from the jar");
            body = in.readAllBytes();
        }
        String type = name.endsWith(".html") ? "text/html; charset=utf-8"
                : name.endsWith(".js") ? "text/javascript; charset=utf-8" : "text/css; charset=utf-8";
        ex.getResponseHeaders().set("Cache-Control", "no-cache");
        WorkbenchServer.send(ex, 200, type, body);
    }
}
