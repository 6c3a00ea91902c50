package org.risetrace.web;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.archive.Archive;
import org.risetrace.archive.ArchiveSettings;

import java.net.InetAddress;
import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.util.HashMap;
import java.util.HexFormat;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The workbench's archive tab over real HTTP on loopback (issue 12, "archive (when the archive exists)"): cases
 * listed and searched as {@code case list/search} lists them, one case shown, the open series added to a case with
 * every original stored byte for byte (SHA-256 by the JDK's MessageDigest, FIPS 180-4), and the refusals: no token,
 * a path out of the root, an unknown case, a malformed body; and no archive endpoints when none was given.
 */
class WorkbenchArchiveTest {
    @TempDir
    static Path tmp;
    static Path root, archiveDir;
    static WorkbenchFixture wb;

    @BeforeAll
    static void start() throws Exception {
        root = Files.createDirectories(tmp.resolve("bench"));
        WorkbenchFixture.copySeries("phase-short", root, true);
        archiveDir = tmp.resolve("archive");
        ArchiveSettings settings = ArchiveSettings.sqlite(archiveDir);
        try (Archive a = Archive.open(settings, "test")) {
            a.createCase(new Archive.NewCase("2026-0042", "ticket 812", "DB-31 buck controller board", "SN-0099",
                    "no output on the core rail", "test"));
            a.createCase(new Archive.NewCase("2026-0043", "walk-in", "DB-12 sensor interface board", null,
                    "draws 2 A at idle", "test"));
        }
        wb = new WorkbenchFixture(new WorkbenchServer.Config(InetAddress.getLoopbackAddress(), 0, List.of(root),
                WorkbenchServer.DEFAULT_MAX_UPLOAD_BYTES, settings, "bench-tech"));
        assertTrue(wb.session().get("archive").asBoolean());
    }

    @AfterAll
    static void stop() {
        if (wb != null) wb.close();
    }

    private static JsonNode json(HttpResponse<String> r, int status) throws Exception {
        assertEquals(status, r.statusCode(), r.body());
        return WorkbenchFixture.JSON.readTree(r.body());
    }

    @Test
    void casesAreListedAndSearched() throws Exception {
        JsonNode all = json(wb.get("/api/archive/cases"), 200);
        assertEquals(2, all.get("cases").size(), all.toString());
        JsonNode found = json(wb.get("/api/archive/cases?text=sensor"), 200);
        assertEquals(1, found.get("cases").size(), found.toString());
        assertEquals("2026-0043", found.get("cases").get(0).get("caseNumber").asText());
        assertEquals(0, json(wb.get("/api/archive/cases?status=closed"), 200).get("cases").size());
        assertTrue(json(wb.get("/api/archive/cases?status=lost"), 400).get("error").asText().contains("status"));
    }

    @Test
    void theOpenSeriesIsAddedToACaseWithItsOriginalsUnchanged() throws Exception {
        JsonNode added = json(wb.post("/api/archive/add-series",
                "{\"case\": \"2026-0042\", \"root\": 0, \"path\": \"phase-short\"}"), 201);
        assertEquals("phase-short", added.get("series").asText());
        JsonNode shown = json(wb.get("/api/archive/case?number=2026-0042"), 200);
        assertEquals("phase-short", shown.get("series").get(0).get("name").asText(), shown.toString());
        assertFalse(shown.toString().contains(root.toString()), "no server path in the reply");
        // every original in the archive equals the file on the bench, by SHA-256
        Map<String, String> bench = new HashMap<>();
        try (Stream<Path> s = Files.list(root.resolve("phase-short"))) {
            for (Path p : s.toList()) bench.put(p.getFileName().toString(), sha256(p));
        }
        try (Archive a = Archive.open(ArchiveSettings.sqlite(archiveDir), "check")) {
            Archive.SeriesRecord rec = a.series("2026-0042", "phase-short");
            assertEquals(91, rec.files().stream().filter(f -> f.role().equals("frame") || f.role().equals("board")).count(),
                    "90 frames and the board file"); // README: phase-short has 90 frames
            for (Archive.StoredFile f : rec.files()) assertEquals(bench.get(f.fileName()), f.sha256(), f.fileName());
            assertTrue(a.custody("2026-0042").stream().anyMatch(e -> e.who().equals("bench-tech (workbench)")),
                    "the custody log names who added it, through the workbench");
        }
        // the same series again is stored once
        assertTrue(json(wb.post("/api/archive/add-series",
                "{\"case\": \"2026-0042\", \"root\": 0, \"path\": \"phase-short\"}"), 201).get("already_present").asBoolean());
    }

    @Test
    void addingIsRefusedWithoutTheTokenOutsideTheRootForAnUnknownCaseAndForABadBody() throws Exception {
        String body = "{\"case\": \"2026-0043\", \"root\": 0, \"path\": \"phase-short\"}";
        String saved = wb.csrf;
        wb.csrf = "";
        try {
            assertEquals(403, wb.post("/api/archive/add-series", body).statusCode());
        } finally {
            wb.csrf = saved;
        }
        assertEquals(403, wb.post("/api/archive/add-series",
                "{\"case\": \"2026-0043\", \"root\": 0, \"path\": \"../archive\"}").statusCode());
        JsonNode unknown = json(wb.post("/api/archive/add-series",
                "{\"case\": \"2026-9999\", \"root\": 0, \"path\": \"phase-short\"}"), 422);
        assertTrue(unknown.get("error").asText().contains("2026-9999"), unknown.toString());
        assertEquals(400, wb.post("/api/archive/add-series", "{\"case\": \"2026-0043\", \"extra\": 1}").statusCode());
        assertEquals(400, wb.get("/api/archive/case?number=../x").statusCode());
        try (Archive a = Archive.open(ArchiveSettings.sqlite(archiveDir), "check")) {
            assertTrue(a.show("2026-0043").series().isEmpty(), "nothing added by a refused request");
        }
    }

    @Test
    void withoutAnArchiveThereIsNoArchiveTab(@TempDir Path other) throws Exception {
        try (WorkbenchFixture plain = new WorkbenchFixture(other, InetAddress.getLoopbackAddress(),
                WorkbenchServer.DEFAULT_MAX_UPLOAD_BYTES)) {
            assertFalse(plain.session().get("archive").asBoolean());
            assertEquals(404, plain.get("/api/archive/cases").statusCode());
        }
    }

    private static String sha256(Path p) throws Exception {
        return HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(Files.readAllBytes(p)));
    }
}
