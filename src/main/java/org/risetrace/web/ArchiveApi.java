package org.risetrace.web;

import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.risetrace.archive.Archive;
import org.risetrace.archive.ArchiveSettings;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * The archive tab's endpoints: list and search cases, show one, add the open series to a case. Each request opens
 * the archive, does one thing through {@link Archive} (the same calls as {@code risetrace case list}, {@code show}
 * and {@code add-series}) and closes it again, so the CLI and other benches may use the same archive meanwhile.
 * Cases are created with {@code risetrace case create}; the page only reads them and adds series.
 */
final class ArchiveApi {
    private static final ObjectMapper STRICT = org.risetrace.frame.StrictJson.builder()
            .enable(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES).build();
    /** Most cases one listing returns. */
    static final int MAX_CASES = 500;

    private final ArchiveSettings settings;
    private final String who;
    private final Roots roots;

    ArchiveApi(ArchiveSettings settings, String who, Roots roots) {
        this.settings = settings;
        this.who = (who == null || who.isBlank() ? "unknown" : who.strip()) + " (workbench)";
        this.roots = roots;
    }

    void handle(WorkbenchServer.Request r, boolean get, String path) throws IOException {
        switch (path) {
            case "/api/archive/cases" -> { if (get) { WorkbenchServer.sendJson(r.ex, 200, cases(r)); return; } }
            case "/api/archive/case" -> { if (get) { WorkbenchServer.sendJson(r.ex, 200, oneCase(r)); return; } }
            case "/api/archive/add-series" -> { if (!get) { WorkbenchServer.sendJson(r.ex, 201, addSeries(r)); return; } }
            default -> throw WebError.notFound("no endpoint " + path.replaceAll("[^\\x20-\\x7e]", "?"));
        }
        throw new WebError(405, path + " does not take " + r.ex.getRequestMethod());
    }

    private Map<String, Object> cases(WorkbenchServer.Request r) {
        String status = blankToNull(r.param("status"));
        if (status != null && !Archive.STATUSES.contains(status))
            throw WebError.badRequest("status must be one of " + Archive.STATUSES);
        String text = blankToNull(r.param("text"));
        if (text != null && text.length() > 200) throw WebError.badRequest("search text longer than 200 characters");
        try (Archive a = Archive.open(settings, who)) {
            List<Archive.CaseRecord> list = a.listCases(new Archive.CaseQuery(status, null, null, text, MAX_CASES));
            Map<String, Object> m = new LinkedHashMap<>();
            m.put("cases", list);
            m.put("limit", MAX_CASES);
            return m;
        }
    }

    private Map<String, Object> oneCase(WorkbenchServer.Request r) {
        String number = r.required("number");
        if (!Archive.CASE_NUMBER.matcher(number).matches()) throw WebError.badRequest("not a case number: " + number);
        try (Archive a = Archive.open(settings, who)) {
            Archive.CaseDetail d = a.show(number);
            Map<String, Object> m = new LinkedHashMap<>();
            m.put("case", d.record());
            List<Map<String, Object>> series = new ArrayList<>();
            for (Archive.SeriesRecord s : d.series()) {
                Map<String, Object> sm = new LinkedHashMap<>();
                sm.put("name", s.name());
                sm.put("added_at", s.addedAt());
                sm.put("added_by", s.addedBy());
                sm.put("injection", s.injection());
                sm.put("notes", s.notes());
                sm.put("files", s.fileCount());
                series.add(sm); // the source folder stays on the server
            }
            m.put("series", series);
            List<Map<String, Object>> analyses = new ArrayList<>();
            for (Archive.AnalysisRecord x : d.analyses()) {
                Map<String, Object> am = new LinkedHashMap<>();
                am.put("series", x.seriesName());
                am.put("analysed_at", x.analysedAt());
                am.put("mode", x.mode());
                am.put("status", x.verdictStatus());
                am.put("ref", x.verdictRef());
                am.put("headline", x.headline());
                am.put("reason", x.reason());
                analyses.add(am);
            }
            m.put("analyses", analyses);
            m.put("custody_entries", d.custody().size());
            return m;
        }
    }

    record AddRequest(@JsonProperty("case") String caseNumber, @JsonProperty("root") Integer root,
                      @JsonProperty("path") String path, @JsonProperty("name") String name) { }

    private Map<String, Object> addSeries(WorkbenchServer.Request r) throws IOException {
        AddRequest q;
        String usage = "body must be {\"case\": case number, \"root\": root index, \"path\": series folder, "
                + "\"name\": optional series name}";
        try {
            q = STRICT.readValue(r.body(WorkbenchServer.MAX_DOCUMENT_BYTES), AddRequest.class);
        } catch (com.fasterxml.jackson.core.JacksonException e) {
            throw WebError.badRequest(usage);
        }
        if (q == null || q.caseNumber() == null || q.root() == null || q.path() == null) throw WebError.badRequest(usage);
        if (!Archive.CASE_NUMBER.matcher(q.caseNumber()).matches())
            throw WebError.badRequest("not a case number: " + q.caseNumber());
        Path dir = roots.resolve(Roots.index(String.valueOf(q.root())), q.path(), true);
        if (!Files.isDirectory(dir)) throw WebError.badRequest("'" + q.path() + "' is not a folder");
        Path board = dir.resolve(Api.BOARD_FILE);
        try (Archive a = Archive.open(settings, who)) {
            Archive.Added added = a.addSeries(q.caseNumber(), dir, blankToNull(q.name()),
                    Files.isRegularFile(board) ? board : null);
            Map<String, Object> m = new LinkedHashMap<>();
            m.put("case", q.caseNumber());
            m.put("series", added.series().name());
            m.put("files", added.series().fileCount());
            m.put("already_present", added.alreadyPresent());
            List<String> warnings = new ArrayList<>();
            for (String w : added.warnings()) warnings.add(roots.redact(w));
            m.put("warnings", warnings);
            return m;
        }
    }

    private static String blankToNull(String s) {
        return s == null || s.isBlank() ? null : s.strip();
    }
}
