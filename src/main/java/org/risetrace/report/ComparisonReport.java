package org.risetrace.report;

import org.risetrace.analysis.Analysis;

import java.nio.file.Path;

/**
 * Outputs of the two-frame (before/after) comparison: the same three files as {@link Reports}. The analysis record
 * carries curves of one or two points and no rates (null); the report then ranks by rise, leaves out the
 * rise-over-time plot and the rate columns, and says "rose most" instead of "heats fastest".
 */
public final class ComparisonReport {
    private ComparisonReport() { }

    public static void writeAll(Analysis pair, Path outDir, String caseNotes) {
        Reports.writeAll(pair, outDir, caseNotes);
    }

    /** As {@link Reports#writeAll(Analysis, Path, String, boolean)}: one set, an earlier one kept unless {@code replace}. */
    public static void writeAll(Analysis pair, Path outDir, String caseNotes, boolean replace) {
        Reports.writeAll(pair, outDir, caseNotes, replace);
    }
}
