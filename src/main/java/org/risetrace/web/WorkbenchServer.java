package org.risetrace.web;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.sun.net.httpserver.HttpExchange;
import com.sun.net.httpserver.HttpServer;
import org.risetrace.frame.InputRejected;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.net.InetAddress;
import java.net.InetSocketAddress;
import java.net.URLDecoder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.SecureRandom;
import java.util.Base64;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;

/**
 * The workbench's HTTP server. Every request passes the same gate before a handler sees it:
 * <ol>
 *   <li>the Host header must name this server (loopback binding: localhost, 127.0.0.1 or [::1] with our port),
 *   which stops a page on another site reaching us through DNS rebinding;</li>
 *   <li>off loopback, every API call carries the access token printed at start ({@code X-Access-Token});</li>
 *   <li>a state-changing request (POST) comes from our own page: an Origin, when sent, equal to our own,
 *   Sec-Fetch-Site not cross-site, and the session's CSRF token ({@code X-CSRF-Token}) matching the session
 *   cookie (SameSite=Strict, HttpOnly);</li>
 *   <li>bodies are bounded (JSON and CSV documents, uploads), read no further than the bound.</li>
 * </ol>
 * Errors leave as {@code {"error": "..."}} with the status; an unexpected fault is logged on the server's
 * stderr and answered with a plain line, never a stack trace.
 */
public final class WorkbenchServer implements AutoCloseable {
    /** Largest JSON or CSV request body. */
    public static final int MAX_DOCUMENT_BYTES = 1 << 20;
    /** Largest uploaded frame file by default (a 640 x 512 float TIFF is 1.3 MB; generous for larger cameras). */
    public static final long DEFAULT_MAX_UPLOAD_BYTES = 64L << 20;

    /** A refused body up to this size is read to its end before the 413 reply (see Request.drain). */
    static final long DRAIN_BYTES = 16L << 20;
    static final String SESSION_COOKIE = "risetrace_session";
    static final ObjectMapper JSON = new ObjectMapper();

    /**
     * @param bind            address to listen on
     * @param port            port (0: any free one)
     * @param roots           folders series are read from and board files written to
     * @param maxUploadBytes  largest uploaded frame
     * @param archive         the evidence archive the archive tab shows (null: no archive tab)
     * @param archiveUser     who the archive's custody log names for what the page does
     */
    public record Config(InetAddress bind, int port, List<Path> roots, long maxUploadBytes,
                         org.risetrace.archive.ArchiveSettings archive, String archiveUser) {
        public Config {
            if (port < 0 || port > 65535) throw new IllegalArgumentException("port must be 0 to 65535");
            if (maxUploadBytes < 1) throw new IllegalArgumentException("upload limit must be positive");
            roots = List.copyOf(roots);
        }

        /** Without an archive. */
        public Config(InetAddress bind, int port, List<Path> roots, long maxUploadBytes) {
            this(bind, port, roots, maxUploadBytes, null, null);
        }
    }

    private final Config config;
    private final HttpServer server;
    private final ExecutorService requestThreads;
    private final Roots roots;
    private final String accessToken; // null on loopback
    private final Map<String, String> csrfBySession = new ConcurrentHashMap<>();
    private final SecureRandom random = new SecureRandom();
    private final Api api;
    private final Jobs jobs;

    private WorkbenchServer(Config config) throws IOException {
        this.config = config;
        this.roots = new Roots(config.roots());
        this.accessToken = config.bind().isLoopbackAddress() ? null : randomToken();
        this.jobs = new Jobs();
        this.api = new Api(roots, jobs, config.maxUploadBytes(),
                config.archive() == null ? null : new ArchiveApi(config.archive(), config.archiveUser(), roots));
        this.server = HttpServer.create(new InetSocketAddress(config.bind(), config.port()), 32);
        this.requestThreads = Executors.newFixedThreadPool(8, r -> {
            Thread t = new Thread(r, "workbench-http");
            t.setDaemon(true);
            return t;
        });
        server.setExecutor(requestThreads);
        server.createContext("/", this::handle);
    }

    /** Starts a server; {@link #url()} says where. */
    public static WorkbenchServer start(Config config) throws IOException {
        WorkbenchServer s = new WorkbenchServer(config);
        s.server.start();
        return s;
    }

    public int port() { return server.getAddress().getPort(); }

    /** The address to open in a browser. */
    /** What the server was started with. */
    public Config config() { return config; }

    public String url() {
        InetAddress a = config.bind();
        String host = a.isLoopbackAddress() ? "localhost"
                : a.isAnyLocalAddress() ? hostName() : hostLiteral(a);
        return "http://" + host + ":" + port() + "/";
    }

    /** The access token the page asks for when bound off loopback; null on loopback. */
    public String accessToken() { return accessToken; }

    public List<Path> roots() { return roots.all(); }

    @Override
    public void close() {
        server.stop(0);
        requestThreads.shutdownNow();
        jobs.close();
    }

    private static String hostName() {
        try {
            return InetAddress.getLocalHost().getHostName();
        } catch (IOException e) {
            return "0.0.0.0";
        }
    }

    private static String hostLiteral(InetAddress a) {
        String h = a.getHostAddress();
        return h.contains(":") ? "[" + h + "]" : h;
    }

    private String randomToken() {
        byte[] b = new byte[24];
        random.nextBytes(b);
        return Base64.getUrlEncoder().withoutPadding().encodeToString(b);
    }

    // ---------------------------------------------------------------------------------------------- the gate

    private void handle(HttpExchange ex) throws IOException {
        try (ex) {
            Request req = new Request(ex);
            try {
                securityHeaders(ex);
                checkHost(ex);
                String path = ex.getRequestURI().getRawPath();
                String method = ex.getRequestMethod();
                if (!method.equals("GET") && !method.equals("HEAD") && !method.equals("POST"))
                    throw new WebError(405, "method " + method + " is not used here");
                if (!path.startsWith("/api/")) {
                    if (!method.equals("GET") && !method.equals("HEAD")) throw new WebError(405, "pages are read with GET");
                    Static.serve(ex, path);
                    return;
                }
                ex.getResponseHeaders().set("Cache-Control", "no-store");
                checkAccessToken(ex);
                String session = session(ex);
                if (method.equals("POST")) checkSameSite(ex, session);
                if (path.equals("/api/session")) {
                    Map<String, Object> m = new HashMap<>(api.session());
                    m.put("csrf", csrfBySession.get(session));
                    sendJson(ex, 200, m);
                    return;
                }
                api.handle(req, method, path);
            } catch (WebError e) {
                sendError(ex, e.status(), e.getMessage());
            } catch (InputRejected e) {
                sendError(ex, 422, roots.redact(e.getMessage()));
            } catch (RuntimeException | IOException | Error e) {
                System.err.println("risetrace serve: internal error on " + ex.getRequestMethod() + " "
                        + ex.getRequestURI().getRawPath());
                e.printStackTrace();
                sendError(ex, 500, "internal error (details on the server's console)");
            }
        }
    }

    private static void securityHeaders(HttpExchange ex) {
        var h = ex.getResponseHeaders();
        h.set("X-Content-Type-Options", "nosniff");
        h.set("X-Frame-Options", "DENY");
        h.set("Referrer-Policy", "no-referrer");
        h.set("Cross-Origin-Opener-Policy", "same-origin");
        h.set("Cross-Origin-Resource-Policy", "same-origin");
        h.set("Content-Security-Policy", "default-src 'self'; img-src 'self' data: blob:; style-src 'self' 'unsafe-inline'; "
                + "connect-src 'self'; frame-ancestors 'none'; base-uri 'none'; form-action 'self'");
    }

    private void checkHost(HttpExchange ex) {
        String host = ex.getRequestHeaders().getFirst("Host");
        if (host == null || host.isBlank()) throw WebError.badRequest("request without a Host header");
        if (accessToken != null) return; // off loopback the token guards every API call
        String h = host.toLowerCase(Locale.ROOT);
        String port = ":" + port();
        if (!(h.equals("localhost" + port) || h.equals("127.0.0.1" + port) || h.equals("[::1]" + port)))
            throw WebError.forbidden("this workbench answers only to localhost:" + port() + " (Host was '"
                    + host.replaceAll("[^\\x20-\\x7e]", "?") + "')");
    }

    private void checkAccessToken(HttpExchange ex) {
        if (accessToken == null) return;
        String given = ex.getRequestHeaders().getFirst("X-Access-Token");
        if (given == null || !MessageDigest.isEqual(given.getBytes(StandardCharsets.UTF_8),
                accessToken.getBytes(StandardCharsets.UTF_8)))
            throw new WebError(401, "access token required: type the token printed when the workbench started");
    }

    /** The caller's session id; a new session (cookie and CSRF token) when it has none we know. */
    private String session(HttpExchange ex) {
        String id = cookie(ex, SESSION_COOKIE);
        if (id != null && csrfBySession.containsKey(id)) return id;
        if (!ex.getRequestMethod().equals("GET"))
            return null; // a POST without a known session is refused by checkSameSite
        if (csrfBySession.size() > 10_000) csrfBySession.clear(); // bounded: a flood only logs everyone out
        id = randomToken();
        csrfBySession.put(id, randomToken());
        ex.getResponseHeaders().add("Set-Cookie", SESSION_COOKIE + "=" + id + "; Path=/; HttpOnly; SameSite=Strict");
        return id;
    }

    private void checkSameSite(HttpExchange ex, String session) {
        var h = ex.getRequestHeaders();
        String origin = h.getFirst("Origin");
        String host = h.getFirst("Host");
        if (origin != null && !origin.equalsIgnoreCase("http://" + host))
            throw WebError.forbidden("cross-site request refused (Origin " + origin.replaceAll("[^\\x20-\\x7e]", "?") + ")");
        String site = h.getFirst("Sec-Fetch-Site");
        if (site != null && !(site.equals("same-origin") || site.equals("none")))
            throw WebError.forbidden("cross-site request refused (Sec-Fetch-Site " + site.replaceAll("[^\\x20-\\x7e]", "?") + ")");
        String token = h.getFirst("X-CSRF-Token");
        String expected = session == null ? null : csrfBySession.get(session);
        if (expected == null || token == null || !MessageDigest.isEqual(token.getBytes(StandardCharsets.UTF_8),
                expected.getBytes(StandardCharsets.UTF_8)))
            throw WebError.forbidden("session token missing or wrong: reload the page");
    }

    static String cookie(HttpExchange ex, String name) {
        List<String> all = ex.getRequestHeaders().get("Cookie");
        if (all == null) return null;
        for (String line : all)
            for (String part : line.split(";")) {
                String p = part.trim();
                if (p.startsWith(name + "=")) return p.substring(name.length() + 1);
            }
        return null;
    }

    // ---------------------------------------------------------------------------------------------- replies

    static void sendJson(HttpExchange ex, int status, Object body) throws IOException {
        byte[] b = body instanceof String s ? s.getBytes(StandardCharsets.UTF_8) : JSON.writeValueAsBytes(body);
        send(ex, status, "application/json; charset=utf-8", b);
    }

    static void sendError(HttpExchange ex, int status, String message) throws IOException {
        sendJson(ex, status, Map.of("error", message == null ? "error" : message));
    }

    static void send(HttpExchange ex, int status, String type, byte[] body) throws IOException {
        ex.getResponseHeaders().set("Content-Type", type);
        if (ex.getRequestMethod().equals("HEAD")) {
            ex.sendResponseHeaders(status, -1);
            return;
        }
        ex.sendResponseHeaders(status, body.length == 0 ? -1 : body.length);
        try (OutputStream o = ex.getResponseBody()) {
            o.write(body);
        }
    }

    /** One request: its decoded query parameters and a bounded body. */
    static final class Request {
        final HttpExchange ex;
        private Map<String, String> query;

        Request(HttpExchange ex) { this.ex = ex; }

        /** A query parameter, URL-decoded once (a '%' left after that is refused where paths are checked). */
        String param(String name) {
            if (query == null) {
                query = new HashMap<>();
                String raw = ex.getRequestURI().getRawQuery();
                if (raw != null && !raw.isEmpty()) {
                    if (raw.length() > 8192) throw WebError.badRequest("query longer than 8192 characters");
                    for (String kv : raw.split("&")) {
                        int eq = kv.indexOf('=');
                        String k = eq < 0 ? kv : kv.substring(0, eq), v = eq < 0 ? "" : kv.substring(eq + 1);
                        try {
                            k = URLDecoder.decode(k, StandardCharsets.UTF_8);
                            v = URLDecoder.decode(v, StandardCharsets.UTF_8);
                        } catch (IllegalArgumentException e) {
                            throw WebError.badRequest("malformed escape in the query");
                        }
                        if (query.put(k, v) != null) throw WebError.badRequest("query parameter '" + k + "' given twice");
                    }
                }
            }
            return query.get(name);
        }

        String required(String name) {
            String v = param(name);
            if (v == null) throw WebError.badRequest("missing query parameter '" + name + "'");
            return v;
        }

        int intParam(String name, int min, int max) {
            String v = required(name);
            if (!v.matches("-?[0-9]{1,9}")) throw WebError.badRequest("'" + name + "' must be a whole number");
            int i = Integer.parseInt(v);
            if (i < min || i > max) throw WebError.badRequest("'" + name + "' must be " + min + " to " + max + ", got " + i);
            return i;
        }

        /** The body, refused with 413 beyond {@code limit} bytes (the declared length first, then as read). */
        byte[] body(long limit) throws IOException {
            String len = ex.getRequestHeaders().getFirst("Content-Length");
            if (len != null) {
                long n;
                try {
                    n = Long.parseLong(len.trim());
                } catch (NumberFormatException e) {
                    throw WebError.badRequest("malformed Content-Length");
                }
                if (n > limit) {
                    drain(ex.getRequestBody(), n);
                    throw new WebError(413, "request body of " + n + " bytes is over the limit of " + limit + " bytes");
                }
            }
            InputStream in = ex.getRequestBody();
            ByteArrayOutputStream out = new ByteArrayOutputStream();
            byte[] buf = new byte[1 << 16];
            long total = 0;
            for (int r; (r = in.read(buf)) > 0; ) {
                total += r;
                if (total > limit) {
                    drain(in, Long.MAX_VALUE);
                    throw new WebError(413, "request body over the limit of " + limit + " bytes");
                }
                out.write(buf, 0, r);
            }
            return out.toByteArray();
        }

        /**
         * Reads and drops what is left of a refused body (at most {@link #DRAIN_BYTES}), so the client reads the
         * 413 reply instead of a connection reset; a larger body is cut off with the connection.
         */
        private static void drain(InputStream in, long declared) throws IOException {
            if (declared > DRAIN_BYTES) return;
            byte[] buf = new byte[1 << 16];
            long total = 0;
            for (int r; (r = in.read(buf)) > 0 && total <= DRAIN_BYTES; ) total += r;
        }
    }
}
