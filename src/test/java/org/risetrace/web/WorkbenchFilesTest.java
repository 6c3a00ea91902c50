package org.risetrace.web;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.net.InetAddress;
import java.net.URI;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.FileSystems;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermission;
import java.nio.file.attribute.PosixFilePermissions;
import java.time.Duration;
import java.util.List;
import java.util.Set;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

/**
 * What the workbench does with the files it finds and writes in a series folder: a board.json that is a FIFO or a
 * folder is refused at once (never waited on, nothing left behind), symbolic links to files are never followed, an
 * uploaded series.json is checked by the core's reader, and written files keep the usual permissions. Real HTTP on
 * loopback, as {@link WorkbenchApiTest}; every request has a timeout, so a hang fails the test instead of stalling it.
 */
class WorkbenchFilesTest {
    static final Duration TIMEOUT = Duration.ofSeconds(20);

    @TempDir
    static Path root;
    @TempDir
    static Path outside;
    static WorkbenchFixture wb;
    static String board;

    @BeforeAll
    static void start() throws Exception {
        board = Files.readString(Path.of("sample-frames/before-after/board.json"));
        wb = new WorkbenchFixture(root, InetAddress.getLoopbackAddress(), 1 << 20);
        wb.session();
        assertNotNull(wb.csrf);
    }

    @AfterAll
    static void stop() {
        wb.close();
    }

    /** A copy of the before-after demo series (2 frames) under the root, as {@code name}, with or without board.json. */
    static Path series(String name, boolean withBoard) throws Exception {
        Path dir = root.resolve(name);
        Files.createDirectory(dir);
        try (Stream<Path> files = Files.list(Path.of("sample-frames/before-after"))) {
            for (Path f : (Iterable<Path>) files::iterator)
                if (withBoard || !f.getFileName().toString().equals("board.json")) Files.copy(f, dir.resolve(f.getFileName()));
        }
        return dir;
    }

    static HttpResponse<String> get(String pathAndQuery) throws Exception {
        return wb.http.send(HttpRequest.newBuilder(URI.create(wb.base() + pathAndQuery)).timeout(TIMEOUT).GET().build(),
                HttpResponse.BodyHandlers.ofString());
    }

    static HttpResponse<String> post(String pathAndQuery, String body) throws Exception {
        return wb.http.send(HttpRequest.newBuilder(URI.create(wb.base() + pathAndQuery)).timeout(TIMEOUT)
                        .header("Origin", wb.base()).header("X-CSRF-Token", wb.csrf)
                        .POST(HttpRequest.BodyPublishers.ofString(body)).build(),
                HttpResponse.BodyHandlers.ofString());
    }

    /** A refusal: the status and a JSON body with one "error" line naming no server path. */
    static String refused(HttpResponse<String> r, int status) throws Exception {
        assertEquals(status, r.statusCode(), r.body());
        JsonNode n = WorkbenchFixture.JSON.readTree(r.body());
        assertTrue(n.hasNonNull("error"), r.body());
        String msg = n.get("error").asText();
        assertFalse(msg.contains("Exception") || msg.contains("\n"), msg);
        assertFalse(msg.contains(root.toString()) || msg.contains(outside.toString()), "no server path in replies: " + msg);
        return msg;
    }

    static List<String> names(Path dir) throws Exception {
        try (Stream<Path> s = Files.list(dir)) {
            return s.map(p -> p.getFileName().toString()).sorted().toList();
        }
    }

    static void mkfifo(Path p) throws Exception {
        Process mk;
        try {
            mk = new ProcessBuilder("mkfifo", p.toString()).inheritIO().start();
        } catch (java.io.IOException e) {
            mk = null;
        }
        assumeTrue(mk != null && mk.waitFor() == 0, "mkfifo is not available here");
    }

    // ------------------------------------------------------------------------------------------ defect 1

    @Test
    void aBoardFileThatIsAFifoIsRefusedAtOnceAndTheServerKeepsAnswering() throws Exception {
        Path dir = series("fifo-board", false);
        mkfifo(dir.resolve("board.json"));
        List<String> before = names(dir);
        // more saves than the server has request threads (8): a save that waited on the FIFO would use one up for good
        for (int k = 0; k < 10; k++) {
            String msg = refused(post("/api/board?root=0&path=fifo-board", board), 409);
            // README: a FIFO is refused at once, never waited on; the reply names the problem
            assertTrue(msg.contains("board.json") && msg.contains("FIFO"), msg);
        }
        // the server still answers: no request thread is stuck
        assertEquals(200, get("/api/browse?root=0&path=").statusCode());
        // nothing left behind: no backup, no temporary file
        assertEquals(before, names(dir));
        // the series still opens, and says why its board.json is not used
        HttpResponse<String> s = get("/api/series?root=0&path=fifo-board");
        assertEquals(200, s.statusCode(), s.body());
        assertTrue(WorkbenchFixture.JSON.readTree(s.body()).path("board_error").asText().contains("not a regular file"), s.body());
        // analyse and compare read board.json too: refused, not waited on
        refused(post("/api/analyse?root=0&path=fifo-board", ""), 422);
        refused(post("/api/compare?root=0&path=fifo-board", "{\"before\":0,\"after\":1}"), 422);
    }

    @Test
    void aBoardFileThatIsAFolderIsRefusedAndNothingIsLeftBehind() throws Exception {
        Path dir = series("folder-board", false);
        Files.createDirectory(dir.resolve("board.json"));
        List<String> before = names(dir);
        String msg = refused(post("/api/board?root=0&path=folder-board", board), 409);
        // a 4xx naming the problem, not a 500 "internal error"
        assertTrue(msg.contains("board.json") && msg.contains("folder"), msg);
        // no empty board.bak-*.json folder, no temporary file
        assertEquals(before, names(dir));
        assertTrue(Files.isDirectory(dir.resolve("board.json")), "the folder itself is left alone");
    }

    // ------------------------------------------------------------------------------------------ defect 2

    @Test
    void linksToFilesOutsideTheRootAreNeverFollowed() throws Exception {
        Path dir = series("file-links", false);
        Path secretFrame = outside.resolve("secret.tif");
        Files.copy(dir.resolve("f0002.tif"), secretFrame);
        Path secretBoard = outside.resolve("board.json");
        Files.writeString(secretBoard, board.replace("DB-7 LED driver board (invented demo)", "SECRET outside board"));
        Files.createSymbolicLink(dir.resolve("f0003.tif"), secretFrame);
        Files.createSymbolicLink(dir.resolve("board.json"), secretBoard);
        byte[] secretBefore = Files.readAllBytes(secretBoard);

        HttpResponse<String> r = get("/api/series?root=0&path=file-links");
        // a file link inside a series does not make the whole series fail
        assertEquals(200, r.statusCode(), r.body());
        JsonNode s = WorkbenchFixture.JSON.readTree(r.body());
        // README: nothing outside the roots can be named, not even through a symbolic link: the linked frame is not listed
        assertEquals(2, s.get("frames").size(), r.body());
        for (JsonNode f : s.get("frames")) assertFalse(f.get("name").asText().equals("f0003.tif"), r.body());
        // ... but skipped with a warning, as the core skips other files that are not regular
        assertTrue(s.get("warnings").toString().contains("skipped f0003.tif: not a regular file (a symbolic link"), r.body());
        // the outside board.json is not returned, and the reply says why
        assertFalse(r.body().contains("SECRET"), r.body());
        assertTrue(s.path("board_error").asText().contains("symbolic link"), r.body());
        // the linked frame cannot be fetched by index (frames 0 and 1 only)
        refused(get("/api/frame?root=0&path=file-links&i=2"), 400);
        // browse counts only the regular frames and offers no board
        JsonNode b = WorkbenchFixture.JSON.readTree(get("/api/browse?root=0&path=").body());
        JsonNode folder = null;
        for (JsonNode f : b.get("folders")) if (f.get("name").asText().equals("file-links")) folder = f;
        assertNotNull(folder, b.toString());
        assertEquals(2, folder.get("frames").asInt(), folder.toString());
        assertFalse(folder.get("board").asBoolean(), folder.toString());
        // a save neither copies the outside file into the root as a backup nor writes through the link
        List<String> before = names(dir);
        assertTrue(refused(post("/api/board?root=0&path=file-links", board), 409).contains("symbolic link"));
        assertEquals(before, names(dir));
        assertArrayEquals(secretBefore, Files.readAllBytes(secretBoard));
        // the analysis and compare do not read the linked board either
        assertTrue(refused(post("/api/analyse?root=0&path=file-links", ""), 422).contains("symbolic link"));
        assertTrue(refused(post("/api/compare?root=0&path=file-links", "{\"before\":0,\"after\":1}"), 422).contains("symbolic link"));
    }

    @Test
    void aSidecarLinkIsRefusedAndASeriesOfLinksOnlyHasNoFrames() throws Exception {
        Path dir = series("sidecar-link", true);
        Path outsideSidecar = outside.resolve("series.json");
        Files.move(dir.resolve("series.json"), outsideSidecar);
        Files.createSymbolicLink(dir.resolve("series.json"), outsideSidecar);
        // as the core refuses a series.json that is not a regular file: the series' times and profile would come from outside
        assertTrue(refused(get("/api/series?root=0&path=sidecar-link"), 422).contains("symbolic link"));

        Path only = Files.createDirectory(root.resolve("only-links"));
        Path frame = outside.resolve("only.tif");
        Files.copy(Path.of("sample-frames/before-after/f0001.tif"), frame);
        Files.createSymbolicLink(only.resolve("f0001.tif"), frame);
        // the linked frame is not read: the folder holds no frames the workbench may read
        assertTrue(refused(get("/api/series?root=0&path=only-links"), 422).contains("no frame files"));
    }

    @Test
    void anOutputFolderLinkedOutOfTheRootIsRefused(@TempDir Path r2, @TempDir Path elsewhere) throws Exception {
        WorkbenchFixture.copySeries("before-after", r2, true);
        Files.createSymbolicLink(r2.resolve("risetrace-out"), elsewhere);
        try (WorkbenchFixture other = new WorkbenchFixture(r2, InetAddress.getLoopbackAddress(), 1 << 20)) {
            other.session();
            HttpResponse<String> r = other.post("/api/analyse?root=0&path=before-after", "");
            // README: the workbench writes results only into its roots, not through a symbolic link
            assertEquals(403, r.statusCode(), r.body());
            assertTrue(r.body().contains("symbolic link"), r.body());
        }
        assertEquals(List.of(), names(elsewhere));
    }

    // ------------------------------------------------------------------------------------------ defect 3

    @Test
    void anUploadedSeriesFileIsCheckedByTheCoresReaderFirst() throws Exception {
        Files.createDirectory(root.resolve("upload-sidecar"));
        // README: 422 for a series file the core rejects
        String msg = refused(post("/api/upload?root=0&path=upload-sidecar&name=series.json", "{\"profile\":"), 422);
        assertTrue(msg.startsWith("series.json: "), msg);
        assertTrue(refused(post("/api/upload?root=0&path=upload-sidecar&name=series.json", "{\"colour\":1}"), 422)
                .contains("unknown field 'colour'"));
        // nothing was stored, so the folder is not stuck with a broken file
        assertEquals(List.of(), names(root.resolve("upload-sidecar")));
        String good = Files.readString(Path.of("sample-frames/before-after/series.json"));
        HttpResponse<String> ok = post("/api/upload?root=0&path=upload-sidecar&name=series.json", good);
        // a correct series.json after a refused one is stored (201), not refused as existing (409)
        assertEquals(201, ok.statusCode(), ok.body());
        assertEquals(good, Files.readString(root.resolve("upload-sidecar/series.json"), StandardCharsets.UTF_8));
    }

    // ------------------------------------------------------------------------------------------ defect 4

    /** The permissions a file and a folder get here when made without any (the platform's default under the umask). */
    static Set<PosixFilePermission> usualFile, usualFolder;

    static void usualPermissions(Path scratch) throws Exception {
        assumeTrue(FileSystems.getDefault().supportedFileAttributeViews().contains("posix"), "POSIX permissions only");
        usualFile = Files.getPosixFilePermissions(Files.createFile(scratch.resolve("probe-file")));
        usualFolder = Files.getPosixFilePermissions(Files.createDirectory(scratch.resolve("probe-folder")));
    }

    @Test
    void aReplacedBoardFileKeepsItsPermissionsAndNewFilesGetTheUsualOnes(@TempDir Path scratch) throws Exception {
        usualPermissions(scratch);
        for (String mode : new String[]{"rw-r--r--", "rw-r-----", "rw-rw-r--"}) {
            Path dir = series("perms-" + mode.replace('-', '_'), true);
            Set<PosixFilePermission> perms = PosixFilePermissions.fromString(mode);
            Files.setPosixFilePermissions(dir.resolve("board.json"), perms);
            HttpResponse<String> r = post("/api/board?root=0&path=" + dir.getFileName(), board);
            assertEquals(200, r.statusCode(), r.body());
            // the replaced file's permissions are kept (not the 0600 of a temporary file)
            assertEquals(perms, Files.getPosixFilePermissions(dir.resolve("board.json")), mode);
            // and the backup keeps them too (a copy with its attributes)
            String backup = WorkbenchFixture.JSON.readTree(r.body()).get("backup").asText();
            assertEquals(perms, Files.getPosixFilePermissions(dir.resolve(backup)), mode);
        }
        Path fresh = series("perms-new", false);
        assertEquals(200, post("/api/board?root=0&path=perms-new", board).statusCode());
        // a new board.json gets what any new file gets here (0644 under the usual umask 0022)
        assertEquals(usualFile, Files.getPosixFilePermissions(fresh.resolve("board.json")));
    }

    @Test
    void uploadsAndAnalysisResultsGetTheUsualPermissions(@TempDir Path scratch) throws Exception {
        usualPermissions(scratch);
        String good = Files.readString(Path.of("sample-frames/before-after/series.json"));
        assertEquals(201, post("/api/upload?root=0&path=perms-upload&name=series.json", good).statusCode());
        // a new folder and file get the usual permissions (0755 and 0644 under umask 0022), not 0600
        assertEquals(usualFolder, Files.getPosixFilePermissions(root.resolve("perms-upload")));
        assertEquals(usualFile, Files.getPosixFilePermissions(root.resolve("perms-upload/series.json")));

        series("perms-analyse", true);
        for (int run = 0; run < 2; run++) {
            HttpResponse<String> start = post("/api/analyse?root=0&path=perms-analyse", "");
            assertEquals(202, start.statusCode(), start.body());
            String id = WorkbenchFixture.JSON.readTree(start.body()).get("job").asText();
            JsonNode job = wb.awaitJob(id, 120);
            assertEquals("done", job.get("state").asText(), job.toString());
            Path out = root.resolve("risetrace-out/perms-analyse");
            // the output folder is readable as any new folder is (not the 0700 of a staging folder), also when replaced
            assertEquals(usualFolder, Files.getPosixFilePermissions(out, LinkOption.NOFOLLOW_LINKS), "run " + run);
            assertEquals(usualFile, Files.getPosixFilePermissions(out.resolve("analysis.json")), "run " + run);
        }
    }
}
