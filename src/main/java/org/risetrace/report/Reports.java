package org.risetrace.report;

import org.risetrace.analysis.Analysis;

import java.nio.file.Path;

/** Writes every output of an analysis into one folder: analysis.json, parts.csv and report.html. */
public final class Reports {
    static {
        // the plots are drawn off screen: never open a display, also on machines that have one
        if (System.getProperty("java.awt.headless") == null) System.setProperty("java.awt.headless", "true");
    }

    public static final String JSON_FILE = "analysis.json";
    public static final String CSV_FILE = "parts.csv";
    public static final String HTML_FILE = "report.html";

    private Reports() { }

    /** Writes the three outputs into {@code outDir} (created when missing), replacing earlier ones. */
    public static void writeAll(Analysis analysis, Path outDir) {
        writeAll(analysis, outDir, null);
    }

    /** As {@link #writeAll(Analysis, Path)}, with case notes (e.g. the sidecar's notes) for the report header. */
    public static void writeAll(Analysis analysis, Path outDir, String caseNotes) {
        writeAll(analysis, outDir, caseNotes, true);
    }

    /**
     * Writes the three outputs into {@code outDir} as one set ({@link OutputFolder}: a kill at any moment leaves the
     * previous complete set or the new one). An earlier analysis there is replaced only with {@code replace}, else
     * refused ({@code InputRejected}).
     */
    public static void writeAll(Analysis analysis, Path outDir, String caseNotes, boolean replace) {
        // every file is rendered before anything is written: a failure while rendering leaves the folder untouched
        String json = AnalysisJson.toJson(analysis.result());
        String csv = PartsCsv.toCsv(analysis);
        String html = ReportHtml.toHtml(analysis, caseNotes);
        OutputFolder.write(outDir, OutputFolder.set(json, csv, html), replace);
    }

    /** Refuses an output folder that cannot take an analysis (see {@link OutputFolder#check}), before the work. */
    public static void checkOutputFolder(Path outDir, boolean replace) {
        OutputFolder.check(outDir, java.util.Set.of(JSON_FILE, CSV_FILE, HTML_FILE), replace);
    }
}
