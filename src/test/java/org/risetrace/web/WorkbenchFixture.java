package org.risetrace.web;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.net.CookieManager;
import java.net.InetAddress;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;

/** A workbench on loopback over a copy of a bundled series, and a client that talks to it as the page does. */
final class WorkbenchFixture implements AutoCloseable {
    static final ObjectMapper JSON = new ObjectMapper();

    final Path root;
    final WorkbenchServer server;
    final HttpClient http = HttpClient.newBuilder().cookieHandler(new CookieManager()).build();
    String csrf;

    WorkbenchFixture(Path root, InetAddress bind, long maxUpload) throws IOException {
        this(new WorkbenchServer.Config(bind, 0, List.of(root), maxUpload));
    }

    /** A workbench started with this configuration (its first root is the fixture's root). */
    WorkbenchFixture(WorkbenchServer.Config config) throws IOException {
        this.root = config.roots().get(0);
        this.server = WorkbenchServer.start(config);
    }

    /** Copies sample-frames/&lt;name&gt; under the root, without its board.json (the user marks it). */
    static void copySeries(String name, Path root, boolean withBoard) {
        Path from = Path.of("sample-frames", name), to = root.resolve(name);
        try (Stream<Path> files = Files.list(from)) {
            Files.createDirectories(to);
            for (Path f : (Iterable<Path>) files::iterator)
                if (withBoard || !f.getFileName().toString().equals("board.json")) Files.copy(f, to.resolve(f.getFileName()));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    String base() { return "http://127.0.0.1:" + server.port(); }

    /** GET /api/session: the session cookie and CSRF token, as the page's first call. */
    JsonNode session() throws Exception {
        HttpResponse<String> r = get("/api/session");
        JsonNode n = JSON.readTree(r.body());
        csrf = n.path("csrf").asText(null);
        return n;
    }

    HttpResponse<String> get(String pathAndQuery) throws Exception {
        return http.send(HttpRequest.newBuilder(URI.create(base() + pathAndQuery)).GET().build(),
                HttpResponse.BodyHandlers.ofString());
    }

    /** A POST as the page makes it: our Origin and the session's CSRF token. */
    HttpResponse<String> post(String pathAndQuery, byte[] body) throws Exception {
        return http.send(HttpRequest.newBuilder(URI.create(base() + pathAndQuery))
                        .header("Origin", "http://127.0.0.1:" + server.port())
                        .header("X-CSRF-Token", csrf == null ? "" : csrf)
                        .POST(HttpRequest.BodyPublishers.ofByteArray(body)).build(),
                HttpResponse.BodyHandlers.ofString());
    }

    HttpResponse<String> post(String pathAndQuery, String body) throws Exception {
        return post(pathAndQuery, body.getBytes(java.nio.charset.StandardCharsets.UTF_8));
    }

    /** The job's state once it is done or failed, polled every 200 ms; the test fails after timeoutS seconds. */
    JsonNode awaitJob(String id, long timeoutS) throws Exception {
        long until = System.nanoTime() + timeoutS * 1_000_000_000L;
        JsonNode job;
        do {
            Thread.sleep(200);
            job = JSON.readTree(get("/api/job?id=" + id).body());
            org.junit.jupiter.api.Assertions.assertTrue(System.nanoTime() < until, "analysis did not finish: " + job);
        } while (!job.get("state").asText().matches("done|failed"));
        return job;
    }

    @Override
    public void close() {
        server.close();
    }
}
