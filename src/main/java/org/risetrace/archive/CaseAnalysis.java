package org.risetrace.archive;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.AnalysisOptions;
import org.risetrace.analysis.Analyzer;
import org.risetrace.analysis.LockIn;
import org.risetrace.analysis.LockInAnalyzer;
import org.risetrace.analysis.SeriesAnalyzer;
import org.risetrace.analysis.Verdict;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.calibration.Materials;
import org.risetrace.io.Series;
import org.risetrace.report.LockInReport;
import org.risetrace.report.ReportHtml;
import org.risetrace.report.Reports;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.PreparedStatement;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;

/**
 * Analyses an archived series with the same entry points as {@code risetrace analyze} (steady rise, or lock-in for a
 * periodic injection): the stored files are copied out to a temporary folder (each checked against its SHA-256),
 * analysed, and the outputs (analysis.json, parts.csv, report.html) stored with the analysis record and its custody
 * entry in one transaction.
 */
public final class CaseAnalysis {
    /** Which analysis runs: as {@code risetrace analyze --mode}. */
    public enum Mode { AUTO, STEADY, LOCK_IN }

    private static final ObjectMapper JSON = new ObjectMapper();

    private CaseAnalysis() { }

    public static Archive.AnalysisRecord analyse(Archive a, String caseNumber, String seriesName, AnalysisOptions options,
                                                 Mode mode, int threads, Analyzer.Progress progress) {
        Archive.SeriesRecord sr = a.series(caseNumber, seriesName);
        if (sr.files().stream().noneMatch(f -> f.role().equals("board")))
            throw new ArchiveException(null, "series '" + seriesName + "' of case " + caseNumber + " has no board file",
                    "add the series again under a new name with --board");
        Path work = null;
        try {
            work = a.store.temporaryFolder();
            Path folder = a.materialise(sr, work.resolve("series"));
            Path out = work.resolve("out");
            Series s = Series.open(folder);
            Path boardFile = folder.resolve("board.json");
            Board b = BoardFile.read(boardFile, Materials.load().names());
            String label = "case " + caseNumber + ", series " + seriesName;
            String notes = s.sidecar() == null ? null : s.sidecar().notes();
            Verdict v;
            String headline, modeName;
            if (mode == Mode.LOCK_IN || (mode == Mode.AUTO && LockInAnalyzer.periodic(s))) {
                LockIn li = LockInAnalyzer.analyze(s, b, boardFile, label, options, SeriesAnalyzer.emissivity(s.profile()),
                        threads, progress);
                LockInReport.writeAll(li, out, notes, true);
                v = li.result().verdict();
                headline = LockInReport.headline(li.result());
                modeName = "lock-in";
            } else {
                Analysis an = SeriesAnalyzer.analyzeOrCompare(s, b, boardFile, label, options, threads, progress);
                Reports.writeAll(an, out, notes, true);
                v = an.result().verdict();
                headline = ReportHtml.headline(an);
                modeName = SeriesAnalyzer.isComparison(an) ? "compare" : "steady";
            }
            ObjectNode params = JSON.valueToTree(options.asMap());
            params.put("threads", threads);
            List<Path> made;
            try (Stream<Path> st = Files.list(out)) {
                made = st.filter(Files::isRegularFile).filter(p -> !p.getFileName().toString().startsWith("."))
                        .sorted().toList();
            }
            List<String> names = new ArrayList<>();
            List<ContentStore.Stored> stored = new ArrayList<>();
            for (Path p : made) {
                names.add(p.getFileName().toString());
                stored.add(a.store.put(p, null));
            }
            String jsonSha = null;
            for (int i = 0; i < names.size(); i++) if (names.get(i).equals(Reports.JSON_FILE)) jsonSha = stored.get(i).sha256();
            String analysisJsonSha = jsonSha;
            String version = SeriesAnalyzer.version();
            return a.index.write(c -> {
                long id = Index.next(c, "analyses", "id");
                try (PreparedStatement ps = c.prepareStatement("INSERT INTO analyses (id, case_number, series_name, "
                        + "analysed_at, analysed_by, tool_version, mode, parameters, verdict_status, verdict_ref, headline, "
                        + "reason) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)")) {
                    ps.setLong(1, id);
                    ps.setString(2, caseNumber);
                    ps.setString(3, seriesName);
                    ps.setString(4, Index.now());
                    ps.setString(5, a.who);
                    ps.setString(6, version);
                    ps.setString(7, modeName);
                    ps.setString(8, params.toString());
                    ps.setString(9, v == null ? null : v.status().word());
                    ps.setString(10, v == null ? null : v.ref());
                    ps.setString(11, headline);
                    ps.setString(12, v == null ? null : v.reason());
                    ps.executeUpdate();
                }
                for (int i = 0; i < names.size(); i++)
                    a.recordOutput(c, caseNumber, id, "analysis-output", names.get(i), stored.get(i), false);
                String subject = Digests.analysisSubject(id);
                Custody.append(c, a.who, "analyse", caseNumber, subject, analysisJsonSha, Digests.of(c, subject),
                        "series " + seriesName + ", " + modeName + ": " + headline);
                return Archive.analysisRow(c, id);
            });
        } catch (IOException e) {
            throw new ArchiveException(work, "cannot analyse the archived series: " + e.getMessage(), null, e);
        } finally {
            if (work != null) try {
                ContentStore.deleteTree(work);
            } catch (IOException ignored) {
                // the next open sweeps it
            }
        }
    }
}
