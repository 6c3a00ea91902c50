package org.risetrace.web;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.board.PlacementImport;
import org.risetrace.calibration.Materials;
import org.risetrace.frame.InputRejected;

import java.io.ByteArrayOutputStream;
import java.io.InputStream;
import java.io.OutputStream;
import java.net.InetAddress;
import java.net.Socket;
import java.net.URI;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The workbench's API over real HTTP on loopback (java.net.http.HttpClient, and a raw socket where a header must be
 * forged): what the page uses works, and every refusal of issue 12 item 3 happens, each as a JSON error line with
 * its status, never a stack trace. Status codes as RFC 9110 defines them (400, 401, 403, 404, 405, 409, 413, 422
 * from RFC 4918 as common practice for a well-formed but invalid document).
 */
class WorkbenchApiTest {
    static final String BOARD = "{\"name\":\"DB-31 (test)\",\"size_mm\":[100,70],\"outline\":{\"frame\":\"f0001.png\","
            + "\"corners_px\":[[41,40],[283,46],[277,214],[39,207]]},\"parts\":[{\"ref\":\"Q3\",\"x_mm\":42,\"y_mm\":22,"
            + "\"w_mm\":5,\"h_mm\":6},{\"ref\":\"Q4\",\"x_mm\":42,\"y_mm\":31,\"w_mm\":5,\"h_mm\":6}]}";
    static final long UPLOAD_LIMIT = 4096;

    @TempDir
    static Path root;
    @TempDir
    static Path outside;
    static WorkbenchFixture wb;

    @BeforeAll
    static void start() throws Exception {
        WorkbenchFixture.copySeries("phase-short", root, false);
        WorkbenchFixture.copySeries("before-after", root, true);
        Files.writeString(outside.resolve("secret.json"), "{}");
        Files.createSymbolicLink(root.resolve("link-out"), outside);
        wb = new WorkbenchFixture(root, InetAddress.getLoopbackAddress(), UPLOAD_LIMIT);
        wb.session();
        assertNotNull(wb.csrf);
    }

    @AfterAll
    static void stop() {
        wb.close();
    }

    /** A refusal: the status, a JSON body with one "error" line, and nothing of a stack trace. */
    static String refused(HttpResponse<String> r, int status) throws Exception {
        assertEquals(status, r.statusCode(), r.body());
        assertTrue(r.headers().firstValue("Content-Type").orElse("").startsWith("application/json"), r.headers().toString());
        JsonNode n = WorkbenchFixture.JSON.readTree(r.body());
        assertTrue(n.hasNonNull("error"), r.body());
        String msg = n.get("error").asText();
        assertFalse(msg.contains("Exception") || msg.contains("\tat ") || msg.contains("\n"), msg);
        assertFalse(msg.contains(root.toString()), "no server path in replies: " + msg);
        return msg;
    }

    @Test
    void pageAndSessionAreServedWithAStrictContentPolicy() throws Exception {
        HttpResponse<String> page = wb.get("/");
        assertEquals(200, page.statusCode());
        assertTrue(page.body().contains("<canvas id=\"frame-canvas\""));
        assertTrue(page.headers().firstValue("Content-Security-Policy").orElse("").contains("default-src 'self'"));
        assertFalse(page.body().matches("(?s).*(src|href)=\"(https?:)?//.*"), "nothing loaded from elsewhere");
        assertEquals(200, wb.get("/app.js").statusCode());
        JsonNode s = wb.session();
        assertTrue(s.get("materials").size() > 0);
        assertEquals(256, s.get("palette").size()); // the report's 256-entry colour table
        assertTrue(s.get("safety").asText().startsWith("Disconnect batteries and mains"));
        refused(wb.get("/app.js/../../etc/passwd"), 404);
        refused(wb.get("/nothing"), 404);
    }

    @Test
    void browseSeriesAndFramesReturnWhatTheCoreReads() throws Exception {
        JsonNode b = WorkbenchFixture.JSON.readTree(wb.get("/api/browse?root=0&path=").body());
        JsonNode phase = null;
        for (JsonNode f : b.get("folders")) if (f.get("name").asText().equals("phase-short")) phase = f;
        assertNotNull(phase, b.toString());
        assertEquals(90, phase.get("frames").asInt()); // README: 90 frames
        for (JsonNode f : b.get("folders")) assertFalse(f.get("name").asText().equals("link-out"), "a link out is not offered");
        JsonNode s = WorkbenchFixture.JSON.readTree(wb.get("/api/series?root=0&path=phase-short").body());
        assertEquals(90, s.get("frames").size());
        assertEquals(0.5, s.get("frames").get(1).get("t_s").asDouble(), 1e-12); // series.json: 2 frames/s
        HttpResponse<byte[]> f = wb.http.send(HttpRequest.newBuilder(URI.create(wb.base() + "/api/frame?root=0&path=phase-short&i=0")).build(),
                HttpResponse.BodyHandlers.ofByteArray());
        int w = Integer.parseInt(f.headers().firstValue("X-Width").orElseThrow());
        int h = Integer.parseInt(f.headers().firstValue("X-Height").orElseThrow());
        assertEquals(w * h * 4, f.body().length);
        // the same temperatures as the core's own reader gives for the file
        org.risetrace.frame.Frame core = org.risetrace.io.Series.open(root.resolve("phase-short")).read(0);
        ByteBuffer bb = ByteBuffer.wrap(f.body()).order(ByteOrder.LITTLE_ENDIAN);
        for (int k : new int[]{0, w * h / 2 + 17, w * h - 1}) assertEquals(core.celsius()[k], bb.getFloat(4 * k));
    }

    @Test
    void pathsOutsideTheRootAreRefused() throws Exception {
        assertTrue(refused(wb.get("/api/browse?root=0&path=../"), 403).contains(".."));
        assertTrue(refused(wb.get("/api/browse?root=0&path=phase-short/../.."), 403).contains(".."));
        // %2e%2e is '..' after the one decoding; %252e%252e leaves '%2e%2e', an encoded escape
        assertTrue(refused(wb.get("/api/browse?root=0&path=%2e%2e"), 403).contains(".."));
        assertTrue(refused(wb.get("/api/browse?root=0&path=%252e%252e%252f"), 400).contains("encoded"));
        assertTrue(refused(wb.get("/api/browse?root=0&path=%2Fetc"), 403).contains("absolute"));
        refused(wb.get("/api/series?root=0&path=..%5C..%5Cetc"), 400); // backslashes
        refused(wb.get("/api/series?root=0&path=C:%2FWindows"), 400);
        refused(wb.get("/api/series?root=0&path=phase-short%00"), 400);
        assertTrue(refused(wb.get("/api/browse?root=0&path=link-out"), 403).contains("symbolic link"));
        refused(wb.get("/api/series?root=0&path=link-out"), 403);
        refused(wb.post("/api/board?root=0&path=link-out", BOARD), 403);
        refused(wb.get("/api/browse?root=3&path="), 400);
        String malformed = rawGet("/api/browse?root=0&path=%zz", "localhost:" + wb.server.port(), null);
        assertTrue(malformed.startsWith("HTTP/1.1 400"), malformed);
        refused(wb.get("/api/browse?root=0&path=a&path=b"), 400);
        refused(wb.get("/api/frame?root=0&path=phase-short&i=90"), 400); // frames 0 to 89
        assertFalse(Files.exists(outside.resolve("board.json")));
    }

    @Test
    void stateChangingRequestsNeedTheSessionTokenAndOurOrigin() throws Exception {
        String url = wb.base() + "/api/board?root=0&path=phase-short";
        java.util.function.Supplier<String> board = () -> {
            try {
                Path f = root.resolve("phase-short/board.json");
                return Files.exists(f) ? Files.readString(f) : null;
            } catch (java.io.IOException e) {
                throw new java.io.UncheckedIOException(e);
            }
        };
        String boardBefore = board.get();
        HttpRequest.Builder noToken = HttpRequest.newBuilder(URI.create(url)).POST(HttpRequest.BodyPublishers.ofString(BOARD));
        refused(wb.http.send(noToken.build(), HttpResponse.BodyHandlers.ofString()), 403);
        HttpRequest wrong = HttpRequest.newBuilder(URI.create(url)).header("X-CSRF-Token", "guess")
                .POST(HttpRequest.BodyPublishers.ofString(BOARD)).build();
        refused(wb.http.send(wrong, HttpResponse.BodyHandlers.ofString()), 403);
        // a cross-site page that somehow holds the token: its Origin or Sec-Fetch-Site gives it away
        HttpRequest crossOrigin = HttpRequest.newBuilder(URI.create(url)).header("X-CSRF-Token", wb.csrf)
                .header("Origin", "http://evil.example").POST(HttpRequest.BodyPublishers.ofString(BOARD)).build();
        assertTrue(refused(wb.http.send(crossOrigin, HttpResponse.BodyHandlers.ofString()), 403).contains("cross-site"));
        HttpRequest crossSite = HttpRequest.newBuilder(URI.create(url)).header("X-CSRF-Token", wb.csrf)
                .header("Sec-Fetch-Site", "cross-site").POST(HttpRequest.BodyPublishers.ofString(BOARD)).build();
        assertTrue(refused(wb.http.send(crossSite, HttpResponse.BodyHandlers.ofString()), 403).contains("cross-site"));
        // a fresh client (another browser profile, no session cookie) with a token from elsewhere
        HttpRequest otherSession = HttpRequest.newBuilder(URI.create(url)).header("X-CSRF-Token", wb.csrf)
                .POST(HttpRequest.BodyPublishers.ofString(BOARD)).build();
        refused(java.net.http.HttpClient.newHttpClient().send(otherSession, HttpResponse.BodyHandlers.ofString()), 403);
        assertEquals(boardBefore, board.get(), "nothing was written by a refused request");
        refused(wb.http.send(HttpRequest.newBuilder(URI.create(url)).method("PUT", HttpRequest.BodyPublishers.ofString(BOARD)).build(),
                HttpResponse.BodyHandlers.ofString()), 405);
    }

    @Test
    void aForeignHostHeaderIsRefusedOnLoopback() throws Exception {
        // DNS rebinding: a page at evil.example whose name now resolves to 127.0.0.1 sends Host: evil.example:port
        String reply = rawGet("/api/session", "evil.example:" + wb.server.port(), null);
        assertTrue(reply.startsWith("HTTP/1.1 403"), reply);
        assertTrue(reply.contains("{\"error\":"), reply);
        assertTrue(rawGet("/api/session", "localhost:" + wb.server.port(), null).startsWith("HTTP/1.1 200"));
    }

    static String rawGet(String path, String host, String token) throws Exception {
        try (Socket s = new Socket(InetAddress.getLoopbackAddress(), hostPort(host))) {
            OutputStream o = s.getOutputStream();
            o.write(("GET " + path + " HTTP/1.1\r\nHost: " + host + "\r\n" + (token == null ? "" : "X-Access-Token: " + token + "\r\n")
                    + "Connection: close\r\n\r\n").getBytes(StandardCharsets.US_ASCII));
            o.flush();
            InputStream in = s.getInputStream();
            ByteArrayOutputStream b = new ByteArrayOutputStream();
            in.transferTo(b);
            return b.toString(StandardCharsets.UTF_8);
        }
    }

    private static int hostPort(String host) {
        return Integer.parseInt(host.substring(host.lastIndexOf(':') + 1));
    }

    @Test
    void offLoopbackEveryApiCallNeedsTheAccessToken(@TempDir Path r2) throws Exception {
        WorkbenchFixture.copySeries("before-after", r2, true);
        try (WorkbenchFixture open = new WorkbenchFixture(r2, InetAddress.getByName("0.0.0.0"), UPLOAD_LIMIT)) {
            String token = open.server.accessToken();
            assertNotNull(token, "binding off loopback makes an access token");
            assertTrue(token.length() >= 32, token); // 24 random bytes, base64url
            refused(open.get("/api/session"), 401);
            refused(open.get("/api/browse?root=0&path="), 401);
            refused(open.post("/api/board?root=0&path=before-after", BOARD), 401);
            HttpRequest wrong = HttpRequest.newBuilder(URI.create(open.base() + "/api/session")).header("X-Access-Token", token + "x").build();
            refused(open.http.send(wrong, HttpResponse.BodyHandlers.ofString()), 401);
            assertEquals(200, open.get("/").statusCode(), "the page loads, then asks for the token");
            HttpRequest right = HttpRequest.newBuilder(URI.create(open.base() + "/api/session")).header("X-Access-Token", token).build();
            assertEquals(200, open.http.send(right, HttpResponse.BodyHandlers.ofString()).statusCode());
        }
        try (WorkbenchFixture local = new WorkbenchFixture(r2, InetAddress.getLoopbackAddress(), UPLOAD_LIMIT)) {
            assertEquals(null, local.server.accessToken(), "no token on loopback");
        }
    }

    @Test
    void oversizeBodiesAndUploadsAreRefused() throws Exception {
        byte[] big = new byte[WorkbenchServer.MAX_DOCUMENT_BYTES + 1];
        java.util.Arrays.fill(big, (byte) ' ');
        assertTrue(refused(wb.post("/api/board?root=0&path=phase-short", big), 413).contains("limit"));
        byte[] frame = Files.readAllBytes(root.resolve("before-after/f0001.tif"));
        assertTrue(frame.length > UPLOAD_LIMIT);
        assertTrue(refused(wb.post("/api/upload?root=0&path=up&name=f0001.tif", frame), 413).contains("limit"));
        assertFalse(Files.exists(root.resolve("up/f0001.tif")));
        byte[] small = Files.readAllBytes(root.resolve("phase-short/series.json"));
        assertTrue(small.length > UPLOAD_LIMIT, "series.json is larger than the test limit too");
        byte[] png = Files.readAllBytes(Path.of("src/test/resources/fixtures/import/grey8-imagemagick.png"));
        assertTrue(png.length <= UPLOAD_LIMIT, "fixture size " + png.length);
        HttpResponse<String> ok = wb.post("/api/upload?root=0&path=up&name=a.png", png);
        assertEquals(201, ok.statusCode(), ok.body());
        assertArrayEquals(png, Files.readAllBytes(root.resolve("up/a.png")));
        assertTrue(refused(wb.post("/api/upload?root=0&path=up&name=a.png", new byte[]{1, 2}), 409).contains("nothing was replaced"));
        assertArrayEquals(png, Files.readAllBytes(root.resolve("up/a.png")));
        refused(wb.post("/api/upload?root=0&path=up&name=..%2Fb.png", png), 400);
        refused(wb.post("/api/upload?root=0&path=up&name=run.sh", png), 400);
        refused(wb.post("/api/upload?root=0&path=..%2Fup&name=c.png", png), 403);
        refused(wb.post("/api/upload?root=0&path=link-out&name=c.png", png), 403);
        assertFalse(Files.exists(outside.resolve("c.png")));
    }

    @Test
    void boardsAreCheckedByTheCliRulesAndSavedWithABackup(@TempDir Path scratch) throws Exception {
        String[] bad = {
                BOARD.replace("\"name\"", "\"colour\""),                                    // unknown field
                BOARD.replace("[[41,40],[283,46],[277,214],[39,207]]", "[[41,40],[39,207],[277,214],[283,46]]"), // wrong way round
                BOARD.replace("\"x_mm\":42,\"y_mm\":22", "\"x_mm\":99,\"y_mm\":22"),      // part off the board
                BOARD.replace("\"ref\":\"Q4\"", "\"ref\":\"Q3\""),                            // duplicate designator
                BOARD.replace("\"w_mm\":5,", "\"w_mm\":\"5\","),                              // a string for a number
                BOARD.replace("\"ref\":\"Q3\",", "\"ref\":\"Q3\",\"material\":\"cheese\","),  // unknown material
                "{\"size_mm\":[100,70]}",                                                     // no outline
        };
        for (String b : bad) {
            String msg = refused(wb.post("/api/board?root=0&path=phase-short", b), 422);
            // the same reason the CLI gives for the same bytes
            Path f = scratch.resolve("board.json");
            Files.writeString(f, b);
            InputRejected cli = null;
            try {
                BoardFile.read(f, Materials.load().names());
            } catch (InputRejected e) {
                cli = e;
            }
            assertNotNull(cli, b);
            assertTrue(msg.startsWith("board.json: " + cli.reason()), msg + " vs " + cli.reason());
            refused(wb.post("/api/rectify?root=0&path=phase-short", b), 422);
        }
        String onOtherFrame = BOARD.replace("f0001.png", "f9999.png");
        assertTrue(refused(wb.post("/api/board?root=0&path=phase-short", onOtherFrame), 422).contains("not in this series"));

        Path file = root.resolve("before-after/board.json");
        byte[] before = Files.readAllBytes(file);
        Board original = BoardFile.read(file, null);
        String doc = BoardFile.toJson(new Board("changed", original.sizeMm(), original.outline(), original.parts(), null));
        HttpResponse<String> r = wb.post("/api/board?root=0&path=before-after", doc);
        assertEquals(200, r.statusCode(), r.body());
        JsonNode n = WorkbenchFixture.JSON.readTree(r.body());
        String backup = n.get("backup").asText();
        assertTrue(backup.matches("board\\.bak-\\d{8}T\\d{6}Z(-\\d+)?\\.json"), backup);
        assertArrayEquals(before, Files.readAllBytes(root.resolve("before-after").resolve(backup)), "the old file is kept byte for byte");
        assertEquals("changed", BoardFile.read(file, Materials.load().names()).name());
        HttpResponse<String> again = wb.post("/api/board?root=0&path=before-after", doc);
        assertEquals(200, again.statusCode());
        assertFalse(WorkbenchFixture.JSON.readTree(again.body()).get("backup").asText().equals(backup), "a second backup never overwrites the first");
        try (var s = Files.list(root.resolve("before-after"))) {
            assertTrue(s.noneMatch(p -> p.getFileName().toString().endsWith(".tmp")), "no temporary file left");
        }
        // the series still opens: backups end in .json, which the series reader leaves alone
        assertEquals(2, org.risetrace.io.Series.open(root.resolve("before-after")).size());
    }

    @Test
    void rectifyGivesTheBoardAtTheOutlinesScale() throws Exception {
        HttpResponse<byte[]> r = wb.http.send(HttpRequest.newBuilder(URI.create(wb.base() + "/api/rectify?root=0&path=phase-short"))
                .header("Origin", wb.base()).header("X-CSRF-Token", wb.csrf).POST(HttpRequest.BodyPublishers.ofString(BOARD)).build(),
                HttpResponse.BodyHandlers.ofByteArray());
        assertEquals(200, r.statusCode());
        int w = Integer.parseInt(r.headers().firstValue("X-Width").orElseThrow());
        int h = Integer.parseInt(r.headers().firstValue("X-Height").orElseThrow());
        double px = Double.parseDouble(r.headers().firstValue("X-Px-Per-Mm").orElseThrow());
        // the outline's mean edge length per mm (Rectifier.defaultPxPerMm): edges ~242 px over 100 mm, ~167 px over 70 mm
        assertEquals(2.40, px, 0.02);
        assertEquals(Math.round(100 * px), w);
        assertEquals(Math.round(70 * px), h);
        assertEquals(w * h * 4, r.body().length);
    }

    @Test
    void compareAndPlacementImportUseTheCore() throws Exception {
        HttpResponse<String> c = wb.post("/api/compare?root=0&path=before-after", "{\"before\":0,\"after\":1}");
        assertEquals(200, c.statusCode(), c.body());
        JsonNode doc = WorkbenchFixture.JSON.readTree(c.body()).get("analysis");
        assertEquals("compare", doc.get("parameters").get("mode").asText());
        assertTrue(doc.get("parts").size() > 0);
        refused(wb.post("/api/compare?root=0&path=before-after", "{\"before\":\"0\",\"after\":1}"), 400);
        refused(wb.post("/api/compare?root=0&path=before-after", "{\"before\":0,\"after\":1,\"x\":2}"), 400);
        refused(wb.post("/api/compare?root=0&path=before-after", "{\"before\":0,\"after\":0}"), 400);
        refused(wb.post("/api/compare?root=0&path=before-after", "{\"before\":0,\"after\":5}"), 400);

        Path csv = Path.of("src/test/resources/fixtures/board/placement-mm.csv");
        HttpResponse<String> p = wb.post("/api/placement?units=mm", Files.readAllBytes(csv));
        assertEquals(200, p.statusCode(), p.body());
        JsonNode parts = WorkbenchFixture.JSON.readTree(p.body()).get("parts");
        Board direct = PlacementImport.read(csv, PlacementImport.Options.defaults()).board();
        assertEquals(direct.partsOrEmpty().size(), parts.size());
        for (int i = 0; i < parts.size(); i++) {
            assertEquals(direct.partsOrEmpty().get(i).ref(), parts.get(i).get("ref").asText());
            assertEquals(direct.partsOrEmpty().get(i).xMm(), parts.get(i).get("x_mm").asDouble(), 0);
        }
        // with the board size the page knows, as the CLI's --size-mm: y measured up from the bottom edge
        HttpResponse<String> sized = wb.post("/api/placement?units=mm&w_mm=100&h_mm=70", Files.readAllBytes(csv));
        assertEquals(200, sized.statusCode(), sized.body());
        JsonNode sizedParts = WorkbenchFixture.JSON.readTree(sized.body()).get("parts");
        PlacementImport.Options d = PlacementImport.Options.defaults();
        Board direct100 = PlacementImport.read(csv, new PlacementImport.Options(null, null, null, null, null, "mm", null, null,
                d.yUp(), "top", java.util.Map.of(), new double[]{100, 70}, null)).board();
        for (int i = 0; i < sizedParts.size(); i++)
            assertEquals(direct100.partsOrEmpty().get(i).yMm(), sizedParts.get(i).get("y_mm").asDouble(), 0);
        assertEquals(70 - 38.0, sizedParts.get(0).get("y_mm").asDouble(), 1e-9); // Q4 at CAD y 38 mm (fixture)
        refused(wb.post("/api/placement?units=mm&w_mm=0&h_mm=70", "a,b"), 400);
        refused(wb.post("/api/placement?units=mm&w_mm=1e9&h_mm=70", "a,b"), 400);
        refused(wb.post("/api/placement?units=inch", "a,b"), 400);
        refused(wb.post("/api/placement?units=mm", "no header here\n1,2,3"), 422);
    }

    @Test
    void analysisRunsInTheBackgroundAndMatchesItsJsonFile() throws Exception {
        refused(wb.get("/api/job?id=nothing"), 404);
        Path dir = root.resolve("phase-short");
        // without a board file the analysis is refused before any work
        Files.deleteIfExists(dir.resolve("board.json"));
        assertTrue(refused(wb.post("/api/analyse?root=0&path=phase-short", ""), 422).contains("save"));
        assertEquals(200, wb.post("/api/board?root=0&path=phase-short", BOARD).statusCode());
        HttpResponse<String> start = wb.post("/api/analyse?root=0&path=phase-short", "");
        assertEquals(202, start.statusCode(), start.body());
        String id = WorkbenchFixture.JSON.readTree(start.body()).get("job").asText();
        JsonNode job = wb.awaitJob(id, 180);
        assertEquals("done", job.get("state").asText(), job.toString());
        assertEquals(90, job.get("total").asInt());
        JsonNode file = WorkbenchFixture.JSON.readTree(root.resolve("risetrace-out/phase-short/analysis.json").toFile());
        assertEquals(file.get("verdict"), job.get("analysis").get("verdict"));
        // the simulator's truth for the bundled series: Q3 is the shorted switch (sample-frames/phase-short/truth.json)
        JsonNode truth = WorkbenchFixture.JSON.readTree(root.resolve("phase-short/truth.json").toFile());
        assertEquals(truth.get("sources").get(0).get("ref").asText(), file.get("verdict").get("ref").asText());
        assertEquals(2, job.get("curves").size());
        HttpResponse<String> report = wb.get("/api/job/report?id=" + id);
        assertEquals(200, report.statusCode());
        assertTrue(report.body().contains("Disconnect batteries and mains"));
        assertTrue(report.headers().firstValue("Content-Security-Policy").orElse("").startsWith("default-src 'none'"));
        HttpResponse<byte[]> map = wb.http.send(HttpRequest.newBuilder(URI.create(wb.base() + "/api/job/map?id=" + id)).build(),
                HttpResponse.BodyHandlers.ofByteArray());
        assertEquals(200, map.statusCode());
    }
}
