package org.risetrace.report;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.BoardMap;
import org.risetrace.analysis.Excitation;
import org.risetrace.analysis.Hotspot;
import org.risetrace.analysis.LockIn;
import org.risetrace.analysis.LockInPart;
import org.risetrace.analysis.LockInResult;
import org.risetrace.analysis.Verdict;
import org.risetrace.analysis.VerdictStatus;
import org.risetrace.board.Board;
import org.risetrace.board.Part;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.Base64;
import java.util.List;
import java.util.Locale;

import static org.risetrace.report.Html.esc;
import static org.risetrace.report.Html.fixed;
import static org.risetrace.report.Html.sig;

/**
 * The outputs of a lock-in analysis: analysis.json is the steady document with {@code "mode": "lock-in"}, the
 * lock-in verdict as {@code verdict} and the lock-in section as {@code lock_in} (which also keeps the steady verdict);
 * parts.csv is the steady one (rise over time); report.html is the steady report with the lock-in section (verdict,
 * amplitude and lag maps, part table, excitation timing, sensitivity) in front of it.
 */
public final class LockInReport {
    static {
        if (System.getProperty("java.awt.headless") == null) System.setProperty("java.awt.headless", "true");
    }

    private static final ObjectMapper JSON = AnalysisJson.mapper();

    private LockInReport() { }

    /** Writes analysis.json, parts.csv and report.html into outDir (each through a temporary file and a move). */
    public static void writeAll(LockIn lockIn, Path outDir, String caseNotes) {
        writeAll(lockIn, outDir, caseNotes, true);
    }

    /**
     * The three outputs as one set ({@link OutputFolder}, as {@link Reports#writeAll}): rendered first, then a kill
     * at any moment leaves the previous complete set or the new one; an earlier analysis is replaced only with
     * {@code replace}.
     */
    public static void writeAll(LockIn lockIn, Path outDir, String caseNotes, boolean replace) {
        String json = toJson(lockIn), csv = PartsCsv.toCsv(lockIn.steady()), html = toHtml(lockIn, caseNotes);
        OutputFolder.write(outDir, OutputFolder.set(json, csv, html), replace);
    }

    /** The analysis.json document of a lock-in analysis. */
    public static String toJson(LockIn lockIn) {
        ObjectNode doc = JSON.valueToTree(lockIn.steady().result());
        ObjectNode out = JSON.createObjectNode();
        doc.fields().forEachRemaining(e -> {
            if (e.getKey().equals("parameters")) out.put("mode", "lock-in");
            out.set(e.getKey(), e.getKey().equals("verdict") ? JSON.valueToTree(lockIn.result().verdict()) : e.getValue());
        });
        out.set("lock_in", JSON.valueToTree(lockIn.result()));
        try {
            return JSON.writerWithDefaultPrettyPrinter().writeValueAsString(out) + "\n";
        } catch (IOException e) {
            throw new UncheckedIOException("analysis.json could not be serialised", e);
        }
    }

    /** The verdict in one line. */
    public static String headline(LockInResult r) {
        Verdict v = r.verdict();
        if (v.status() == VerdictStatus.IDENTIFIED) {
            LockInPart p = part(r, v.ref());
            String s = v.ref() + " follows the periodic injection"
                    + (p == null ? "" : String.format(Locale.ROOT, ": %s K amplitude", sig(p.amplitudeK(), 2)))
                    + (p == null || p.lagDeg() == null ? "" : String.format(Locale.ROOT, ", lag %.0f\u00b0", p.lagDeg()));
            return s + (v.runnerUpRef() == null || v.separationSigma() == null ? ""
                    : ", " + fixed(v.separationSigma(), 1) + " sigma ahead of " + v.runnerUpRef());
        }
        return (v.status() == VerdictStatus.NO_HEATING ? "No periodic heating above the noise" : "Inconclusive")
                + (v.reason() == null ? "" : ": " + v.reason());
    }

    static LockInPart part(LockInResult r, String ref) {
        for (LockInPart p : r.parts()) if (p.ref().equals(ref)) return p;
        return null;
    }

    /** The steady report's cautions and those of a supply switched on and off. */
    public static final String SAFETY_TEXT = ReportHtml.SAFETY_TEXT + " A switched supply is still a live supply:"
            + " the board is powered whenever the timer switches it on, and a part that heats in pulses still burns.";

    /** The steady report with the lock-in section in front of it. */
    public static String toHtml(LockIn lockIn, String caseNotes) {
        String steady = ReportHtml.toHtml(lockIn.steady(), caseNotes);
        String section = section(lockIn);
        // after the page header (board, series, notes); should the steady page change shape, at the top of <main>
        int at = after(steady, "</header>\n");
        if (at < 0) at = after(steady, "<main>\n");
        if (at < 0) at = 0;
        return steady.substring(0, at) + section
                + "<h2 class=\"lockin-divider\">Steady analysis of the same frames (for comparison)</h2>\n"
                + steady.substring(at);
    }

    private static int after(String text, String anchor) {
        int i = text.indexOf(anchor);
        return i < 0 ? -1 : i + anchor.length();
    }

    static String section(LockIn li) {
        LockInResult r = li.result();
        Analysis steady = li.steady();
        Board board = steady.board();
        List<Part> parts = board == null ? List.of() : board.partsOrEmpty();
        double boardW = board != null && board.sizeMm() != null ? board.widthMm() : Double.NaN;
        double boardH = board != null && board.sizeMm() != null ? board.heightMm() : Double.NaN;
        Verdict v = r.verdict();
        StringBuilder h = new StringBuilder(1 << 18);
        String status = v.status().word();
        h.append("<section class=\"verdict status-").append(esc(status)).append("\">\n<p class=\"status\">")
                .append(esc(status)).append(" &middot; lock-in analysis</p>\n<p class=\"headline\">")
                .append(esc(headline(r))).append("</p>\n");
        if (v.reason() != null && v.status() == VerdictStatus.IDENTIFIED)
            h.append("<p class=\"reason\">").append(esc(v.reason())).append("</p>\n");
        Verdict sv = r.steadyVerdict();
        if (sv != null)
            h.append("<p class=\"reason\">The steady analysis of the same frames: ").append(esc(sv.status().word()))
                    .append(sv.ref() == null ? "" : " (" + esc(sv.ref()) + ")").append(" \u2013 ")
                    .append(esc(sv.reason())).append("</p>\n");
        h.append("</section>\n");
        // the cautions under the answer, as on a steady report, with those of a switched supply
        h.append("<aside class=\"safety\"><h2>Safety</h2><p>").append(esc(SAFETY_TEXT)).append("</p></aside>\n");

        h.append("<section><h2>Lock-in: excitation and sensitivity</h2>\n<dl class=\"facts\">\n");
        Excitation e = r.excitation();
        fact(h, "Excitation", String.format(Locale.ROOT, "period %s s (%s Hz), on %s s of each period, first switch-on "
                + "at %s s", sig(e.periodS(), 4), sig(e.frequencyHz(), 3), sig(e.onS(), 4), fixed(e.firstOnS(), 2)));
        fact(h, "Timing from", e.source());
        fact(h, "Analysed", String.format(Locale.ROOT, "%d whole periods, %s to %s s, %d frames", r.periods(),
                fixed(r.windowStartS(), 2), fixed(r.windowEndS(), 2), r.framesUsed()));
        fact(h, "Trend removed", r.detrend());
        fact(h, "Noise", r.noise());
        fact(h, "Sensitivity reached", (r.sensitivityK() == null ? "\u2013" : sig(r.sensitivityK(), 2)
                + " K in one board pixel") + (r.bestPartSensitivityK() == null ? "" : ", "
                + sig(r.bestPartSensitivityK(), 2) + " K for a part (median over the parts)")
                + ": the smallest amplitude detectable at 3 sigma");
        fact(h, "To halve it", "capture " + r.periodsToHalve() + " periods in total (" + (r.periodsToHalve() - r.periods())
                + " more): the noise of a lock-in amplitude falls with the square root of the number of periods");
        h.append("</dl>\n</section>\n");

        h.append("<section><h2>Lock-in maps</h2>\n");
        BoardMap amp = li.amplitudeMap();
        if (amp != null) {
            // the bar reaches the strongest point, as the rise map's does, so it agrees with the spot table
            double[] range = ReportHtml.percentiles(amp.values(), 0.0, 1.0);
            figure(h, Plots.mapPng(grid(amp, boardW, boardH), new Plots.Shading(ColourMaps.EMBER, 0,
                            Math.max(range[1], 1e-4), false, "amplitude at the excitation frequency (K)"), parts,
                    r.hotspots()), "Lock-in amplitude map", "Amplitude of each board point's temperature at the "
                    + "excitation's fundamental, apparent kelvin (" + ColourMaps.EMBER.word() + " colour map). The "
                    + "noise floor is the sensitivity above; rings mark the strongest spots.");
        }
        BoardMap lag = li.lagMap();
        if (lag != null && hasFinite(lag.values())) {
            double[] range = ReportHtml.percentiles(lag.values(), 0.0, 1.0);
            figure(h, Plots.mapPng(grid(lag, boardW, boardH), new Plots.Shading(ColourMaps.TIDE, range[0],
                            Math.max(range[1], range[0] + 1), true, "lag behind the excitation (\u00b0)"), parts, null),
                    "Lock-in phase map", "Phase lag behind the excitation (" + ColourMaps.TIDE.word() + " colour map, "
                            + "least lag lightest), where the amplitude is at least 5 standard errors (at 3, noise alone "
                            + "would pass in 1 % of the pixels); hatched elsewhere. Heat spreading from the source arrives later, so the source lags least.");
        } else if (lag != null) {
            h.append("<p class=\"blank\">Phase map: no board point follows the excitation above 5 standard errors.</p>\n");
        }
        h.append("</section>\n");

        h.append("<section><h2>Lock-in: parts by amplitude</h2>\n");
        if (r.parts().isEmpty()) {
            h.append("<p class=\"blank\">No parts are marked on this board.</p>\n");
        } else {
            h.append("<table class=\"ranking\">\n<thead><tr><th>#</th><th>part</th><th>amplitude (K)</th>")
                    .append("<th>SNR</th><th>lag (\u00b0)</th><th>in-phase (K)</th><th>quadrature (K)</th>")
                    .append("<th>noise per frame (K)</th><th>emissivity</th></tr></thead>\n<tbody>\n");
            for (LockInPart p : r.parts()) {
                h.append("<tr").append(p.ref().equals(v.ref()) ? " class=\"leader\"" : "").append("><td>")
                        .append(p.rank()).append("</td><td class=\"ref\">").append(esc(p.ref())).append("</td><td>")
                        .append(Html.withError(p.amplitudeK(), p.amplitudeSeK())).append("</td><td>")
                        .append(fixed(p.snr(), 1)).append("</td><td>")
                        .append(p.lagDeg() == null ? "\u2013" : pm(p.lagDeg(), p.lagSeDeg(), 1)).append("</td><td>")
                        .append(fixed(p.inPhaseK(), 4)).append("</td><td>").append(fixed(p.quadratureK(), 4))
                        .append("</td><td>").append(sig(p.noiseK(), 2)).append("</td><td>")
                        .append(fixed(p.emissivity(), 2)).append("</td></tr>\n");
            }
            h.append("</tbody></table>\n<p class=\"blank\">Amplitudes in object temperature (corrected for each "
                    + "part's emissivity), with their standard errors; lag only where the amplitude is at least 3 "
                    + "standard errors.</p>\n");
        }
        h.append("</section>\n");
        return h.toString();
    }

    private static String pm(Double v, Double se, int decimals) {
        if (v == null || !Double.isFinite(v)) return "\u2013";
        return fixed(v, decimals) + (se == null || !Double.isFinite(se) ? "" : " \u00b1 " + fixed(se, decimals));
    }

    private static boolean hasFinite(float[] v) {
        for (float f : v) if (Float.isFinite(f)) return true;
        return false;
    }

    private static Plots.Grid grid(BoardMap m, double boardW, double boardH) {
        double bw = Double.isFinite(boardW) && boardW > 0 ? boardW : m.width() / m.pxPerMm();
        double bh = Double.isFinite(boardH) && boardH > 0 ? boardH : m.height() / m.pxPerMm();
        return new Plots.Grid(m.width(), m.height(), m.pxPerMm(), m.values(), bw, bh);
    }

    private static void fact(StringBuilder h, String term, String value) {
        if (value == null) return;
        h.append("<div><dt>").append(esc(term)).append("</dt><dd>").append(esc(value)).append("</dd></div>\n");
    }

    private static void figure(StringBuilder h, byte[] png, String alt, String caption) {
        h.append("<figure><img alt=\"").append(esc(alt)).append("\" width=\"").append(Plots.WIDTH_PX)
                .append("\" src=\"data:image/png;base64,").append(Base64.getEncoder().encodeToString(png))
                .append("\"><figcaption>").append(esc(caption)).append("</figcaption></figure>\n");
    }
}
