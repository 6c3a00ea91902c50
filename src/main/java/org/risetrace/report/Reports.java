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

    /**
     * Loads and runs once, on a low-priority daemon thread, the code the report needs (the chart library, Java 2D,
     * fonts, the PNG encoder, the JSON writer), so a command line run pays for it while the first frames are read
     * and the reference is prepared, when one core is idle, not after the analysis. Returns the thread (already
     * started); nothing it computes is used, and a failure in it is ignored (the report itself will then report it).
     */
    public static Thread warmUpInBackground() {
        Thread t = new Thread(() -> {
            try {
                float[] v = new float[32 * 16];
                for (int i = 0; i < v.length; i++) v[i] = i % 32;
                Plots.mapPng(new Plots.Grid(32, 16, 1, v, 32, 16),
                        new Plots.Shading(ColourMaps.EMBER, 0, 31, false, "K"), java.util.List.of(), java.util.List.of());
                double[] ts = {0, 1, 2, 3}, rise = {0, 0.5, 1, 1.5};
                Plots.curvesPng(java.util.List.of(new org.risetrace.analysis.RiseCurve("R1", ts, rise, null, null)), 1.0);
                AnalysisJson.mapper().writeValueAsString(java.util.Map.of("warm", new double[]{1, Double.NaN}));
            } catch (Exception | LinkageError ignored) {
                // only a head start: the report renders (and fails, if it must) on its own
            }
        }, "risetrace-report-warm-up");
        t.setDaemon(true);
        t.setPriority(Thread.MIN_PRIORITY);
        t.start();
        return t;
    }

    /** Refuses an output folder that cannot take an analysis (see {@link OutputFolder#check}), before the work. */
    public static void checkOutputFolder(Path outDir, boolean replace) {
        OutputFolder.check(outDir, java.util.Set.of(JSON_FILE, CSV_FILE, HTML_FILE), replace);
    }
}
