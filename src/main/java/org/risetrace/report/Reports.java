package org.risetrace.report;

import org.risetrace.analysis.Analysis;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
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
        try {
            Files.createDirectories(outDir);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot create the output folder " + outDir, e);
        }
        AnalysisJson.write(analysis.result(), outDir.resolve(JSON_FILE));
        PartsCsv.write(analysis, outDir.resolve(CSV_FILE));
        ReportHtml.write(analysis, outDir.resolve(HTML_FILE), caseNotes);
    }
}
