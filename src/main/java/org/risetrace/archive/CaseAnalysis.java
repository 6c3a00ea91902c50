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
import org.risetrace.frame.InputRejected;
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

    /**
     * A refusal about a file of the copied-out series, named as the user knows it: "case 2026-0001, series ba,
     * board.json: ...". The temporary copy is gone when the message is read, so its path would only confuse (and
     * it tells nothing about which archived file to look at). Refusals about anything else pass unchanged.
     */
    static InputRejected named(InputRejected e, Path work, Path folder, String caseNumber, String seriesName) {
        if (work == null) return e;
        String reason = withoutWorkPaths(e.reason(), work, folder);
        Path f = e.file() == null ? null : e.file().toAbsolutePath().normalize();
        boolean inWork = f != null && f.startsWith(work.toAbsolutePath().normalize());
        if (!inWork && reason.equals(e.reason())) return e;
        StringBuilder where = new StringBuilder("case " + caseNumber + ", series " + seriesName);
        Path series = folder == null ? null : folder.toAbsolutePath().normalize();
        boolean storedFile = inWork && series != null && f.startsWith(series) && !f.equals(series);
        if (storedFile) where.append(", ").append(series.relativize(f));
        // archived originals never change: a board that cannot be read is replaced only by adding the series anew
        String hint = e.hint();
        if (storedFile && f.getFileName().toString().equals("board.json")) {
            String again = "the archived board file cannot be changed; add the series again under another name with "
                    + "--name and a corrected --board";
            hint = hint == null ? again : hint + "; " + again;
        }
        if (!inWork) return new ArchiveException(e.file(), reason, hint, e);
        return new ArchiveException(null, where + ": " + reason, hint, e);
    }

    /** A message with the temporary folder's paths taken out (a copied file by its name, the copy as "the series"). */
    private static String withoutWorkPaths(String text, Path work, Path folder) {
        if (text == null || work == null) return text;
        String out = text;
        // the absolute form first: the path as given may be its tail (an archive named by a relative path)
        for (Path p : folder == null ? List.of(work) : List.of(folder, work))
            for (String form : List.of(p.toAbsolutePath().normalize().toString(), p.toString())) {
                if (p == folder) out = out.replace(form + java.io.File.separator, "").replace(form, "the series");
                else out = out.replace(form, "the temporary work folder");
            }
        return out;
    }

    public static Archive.AnalysisRecord analyse(Archive a, String caseNumber, String seriesName, AnalysisOptions options,
                                                 Mode mode, int threads, Analyzer.Progress progress) {
        Archive.SeriesRecord sr = a.series(caseNumber, seriesName);
        if (sr.files().stream().noneMatch(f -> f.role().equals("board")))
            throw new ArchiveException(null, "series '" + seriesName + "' of case " + caseNumber + " has no board file",
                    "add the series again under a new name with --board");
        Path work = null, folder = null;
        try {
            work = a.store.temporaryFolder();
            folder = a.materialise(sr, work.resolve("series"));
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
        } catch (InputRejected e) {
            throw named(e, work, folder, caseNumber, seriesName);
        } catch (IOException e) {
            String label = "case " + caseNumber + ", series " + seriesName;
            throw new ArchiveException(null, label + ": cannot analyse the archived series: "
                    + withoutWorkPaths(String.valueOf(e.getMessage()), work, folder), null, e);
        } finally {
            if (work != null) try {
                ContentStore.deleteTree(work);
            } catch (IOException ignored) {
                // the next open sweeps it
            }
        }
    }
}
