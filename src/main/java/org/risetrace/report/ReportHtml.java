package org.risetrace.report;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.AnalysisResult;
import org.risetrace.analysis.BoardMap;
import org.risetrace.analysis.FrameRecord;
import org.risetrace.analysis.Hotspot;
import org.risetrace.analysis.PartResult;
import org.risetrace.analysis.RiseCurve;
import org.risetrace.analysis.Verdict;
import org.risetrace.analysis.VerdictStatus;
import org.risetrace.board.Board;
import org.risetrace.board.Part;
import org.risetrace.io.Sidecar;
import org.risetrace.frame.InputRejected;
import org.risetrace.planning.BenchReadings;
import org.risetrace.planning.InjectionPlan;
import org.risetrace.planning.PlanWarning;
import org.risetrace.planning.SeriesInjection;
import org.risetrace.registration.BoardRaster;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Base64;
import java.util.List;
import java.util.Map;

import static org.risetrace.report.Html.esc;
import static org.risetrace.report.Html.fixed;
import static org.risetrace.report.Html.sig;
import static org.risetrace.report.Html.withError;

/**
 * report.html: one self-contained page (styles inline, plots embedded as PNG data URIs, no script, no external
 * reference) that a technician reads at a glance and a shop hands to its customer. Prints on A4.
 */
public final class ReportHtml {
    /** How many of the leading parts the rise-versus-time plot shows. */
    static final int CURVES_SHOWN = 5;

    public static final String SAFETY_TEXT =
            "Disconnect batteries and mains from the board, and discharge its bulk capacitors, before injecting. "
            + "Set the bench supply's current limit before connecting it, and start low. "
            + "Never inject between a core rail and ground above that rail's nominal voltage. "
            + "Parts that heat can burn: do not touch the board during injection or while it cools. "
            + "These notes do not replace local electrical codes or licensed practice; follow them first.";

    private ReportHtml() { }

    public static void write(Analysis analysis, Path file) {
        write(analysis, file, null);
    }

    /** As {@link #write(Analysis, Path)}, with case notes (e.g. the sidecar's notes) printed in the header. */
    public static void write(Analysis analysis, Path file, String caseNotes) {
        try {
            Files.writeString(file, toHtml(analysis, caseNotes), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write " + file, e);
        }
    }

    /** True for a before/after pair: no rates, at most two frames. */
    static boolean isComparison(Analysis a) {
        AnalysisResult r = a.result();
        // the analysis says which it was; a series whose frames mostly failed to register is still a series
        Object mode = r.parameters() == null ? null : r.parameters().get("mode");
        if (mode != null) return "compare".equals(mode);
        boolean anyRate = r.parts() != null && r.parts().stream().anyMatch(p -> finite(p.rateKPerS()));
        int frames = r.frames() == null ? 0 : r.frames().size();
        return !anyRate && frames <= 2;
    }

    /** The verdict in one line of plain words, as the report's headline. */
    /**
     * " over the first N s": the window the rates were fitted over (after the injection start, as widened to the
     * fewest frames a rate needs), so a rate is read as the mean slope over it; "" when not recorded.
     */
    static String rateWindowWords(AnalysisResult r) {
        Object w = r.parameters() == null ? null : r.parameters().get("rate_window_used_s");
        return w instanceof Number n && Double.isFinite(n.doubleValue()) && n.doubleValue() > 0
                ? " over the first " + sig(n.doubleValue(), 2) + " s" : "";
    }

    public static String headline(Analysis a) {
        AnalysisResult r = a.result();
        Verdict v = r.verdict();
        boolean comparison = isComparison(a);
        if (v == null) return "no verdict was reached";
        String reason = v.reason() == null || v.reason().isBlank() ? "" : ": " + v.reason();
        if (v.status() == VerdictStatus.NO_HEATING) return "No part heats above the noise" + reason;
        if (v.status() == VerdictStatus.INCONCLUSIVE) return "Inconclusive" + reason;
        if (v.ref() == null) return "Identified" + reason;
        if (comparison || !finite(v.rateKPerS())) {
            PartResult p = part(r, v.ref());
            String rise = p != null && finite(p.riseK()) ? ": " + sig(p.riseK(), 3) + " K" : "";
            String ahead = v.runnerUpRef() == null ? "" : (finite(v.separationSigma())
                    ? ", " + fixed(v.separationSigma(), 1) + " sigma ahead of " + v.runnerUpRef()
                    : ", ahead of " + v.runnerUpRef());
            return v.ref() + " rose most" + rise + ahead;
        }
        StringBuilder sb = new StringBuilder(v.ref()).append(" heats fastest: ").append(sig(v.rateKPerS(), 2))
                .append(" K/s").append(rateWindowWords(r));
        if (v.runnerUpRef() != null) {
            sb.append(finite(v.separationSigma()) ? ", " + fixed(v.separationSigma(), 1) + " sigma ahead of "
                    : ", ahead of ").append(v.runnerUpRef());
        }
        return sb.toString();
    }

    /** The hottest spot when it lies on no marked part, else null. */
    static Hotspot unmarkedHottest(AnalysisResult r) {
        if (r.hotspots() == null || r.hotspots().isEmpty()) return null;
        Hotspot h = r.hotspots().get(0);
        return h.ref() == null ? h : null;
    }

    static String unmarkedSentence(Hotspot h) {
        return "The hottest spot, at " + fixed(h.xMm(), 1) + ", " + fixed(h.yMm(), 1)
                + " mm, is on no marked part: mark the part there.";
    }

    public static String toHtml(Analysis a, String caseNotes) {
        AnalysisResult r = a.result();
        boolean comparison = isComparison(a);
        Board board = a.board();
        List<Part> parts = board == null ? List.of() : board.partsOrEmpty();
        List<PartResult> ranked = r.parts() == null ? List.of() : r.parts();
        List<Hotspot> hotspots = r.hotspots() == null ? List.of() : r.hotspots();
        List<FrameRecord> frames = r.frames() == null ? List.of() : r.frames();
        double boardW = board != null && board.sizeMm() != null ? board.widthMm() : Double.NaN;
        double boardH = board != null && board.sizeMm() != null ? board.heightMm() : Double.NaN;

        StringBuilder h = new StringBuilder(1 << 20);
        Figures figs = new Figures();
        h.append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n")
                .append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n")
                .append("<title>").append(esc(titleOf(a))).append("</title>\n<style>\n").append(CSS)
                .append("</style>\n</head>\n<body>\n<main>\n");

        // header block
        h.append("<header>\n<p class=\"kicker\">risetrace thermal fault report</p>\n<h1>")
                .append(esc(board != null && board.name() != null ? board.name() : "Board")).append("</h1>\n")
                .append("<dl class=\"facts\">\n");
        fact(h, "Series", r.series());
        fact(h, "Board file", r.board());
        fact(h, "Analysed", readableTime(r.createdUtc()));
        fact(h, "Calibration profile", r.profile());
        fact(h, "Frames", frames.size() + " (" + frames.stream().filter(FrameRecord::used).count() + " used)");
        fact(h, "Tool", (r.tool() == null ? "risetrace" : r.tool()) + " " + (r.version() == null ? "" : r.version()));
        h.append("</dl>\n");
        String injectionNotes = r.injection() == null ? null : r.injection().notes();
        h.append("<section class=\"notes\"><h2>Case notes</h2>\n");
        boolean anyNotes = false;
        if (caseNotes != null && !caseNotes.isBlank()) {
            h.append("<p class=\"pre\">").append(esc(caseNotes.strip())).append("</p>\n");
            anyNotes = true;
        }
        if (injectionNotes != null && !injectionNotes.isBlank()) {
            h.append("<p class=\"pre\"><span class=\"label\">Injection notes:</span> ")
                    .append(esc(injectionNotes.strip())).append("</p>\n");
            anyNotes = true;
        }
        if (!anyNotes) h.append("<p class=\"blank\">No notes were recorded with this series.</p>\n");
        h.append("<div class=\"writein\"></div>\n</section>\n</header>\n");

        // verdict
        Verdict v = r.verdict();
        String status = v == null || v.status() == null ? "none" : v.status().word();
        h.append("<section class=\"verdict status-").append(esc(status)).append("\">\n<p class=\"status\">")
                .append(esc(status)).append(comparison ? " &middot; before/after comparison" : "").append("</p>\n")
                .append("<p class=\"headline\">").append(esc(headline(a))).append("</p>\n");
        if (v != null && v.status() == VerdictStatus.IDENTIFIED && v.reason() != null && !v.reason().isBlank())
            h.append("<p class=\"reason\">").append(esc(v.reason())).append("</p>\n");
        long failedFrames = frames.stream().filter(f -> !f.used()).count();
        if (!frames.isEmpty() && failedFrames * 5 >= frames.size())
            h.append("<p class=\"unmarked\">").append(failedFrames).append(" of ").append(frames.size())
                    .append(" frames could not be mapped onto the board and were left out; the answer rests on ")
                    .append(frames.size() - failedFrames).append(frames.size() - failedFrames == 1 ? " frame." : " frames.")
                    .append("</p>\n");
        Hotspot unmarked = unmarkedHottest(r);
        // said once: when the verdict itself is about the unmarked spot, its reason already asks for the part
        boolean verdictSaysIt = v != null && v.reason() != null && v.reason().contains("no marked part");
        if (unmarked != null && !verdictSaysIt)
            h.append("<p class=\"unmarked\">").append(esc(unmarkedSentence(unmarked))).append("</p>\n");
        if (r.seriesWarnings() != null && !r.seriesWarnings().isEmpty()) {
            // an assumed profile or frame interval changes every number above: said beside the answer
            h.append("<div class=\"unmarked assumed\"><p>Reading the series, risetrace assumed or left out:</p><ul>");
            for (String w : r.seriesWarnings()) h.append("<li>").append(esc(w)).append("</li>");
            h.append("</ul></div>\n");
        }
        h.append("</section>\n");

        // safety
        h.append("<aside class=\"safety\"><h2>Safety</h2><p>").append(esc(SAFETY_TEXT)).append("</p></aside>\n");

        // maps
        h.append("<section><h2>Thermal images in board space</h2>\n");
        BoardRaster last = a.lastFrame();
        if (last != null) {
            float[] c = new float[last.width() * last.height()];
            for (int i = 0; i < c.length; i++)
                c[i] = last.valid() == null || last.valid()[i] ? last.celsius()[i] : Float.NaN;
            double[] range = percentiles(c, 0.01, 0.995);
            Plots.Grid g = grid(last.width(), last.height(), last.pxPerMm(), c, boardW, boardH);
            figure(h, figs, () -> Plots.mapPng(g, new Plots.Shading(ColourMaps.EMBER, range[0], range[1], false,
                            "apparent temperature (\u00b0C)"), parts, null),
                    "Last frame", "The last usable frame, rectified onto the board, in apparent temperature ("
                            + ColourMaps.EMBER.word() + " colour map: darker is cooler). Hatched: outside the frame."
                            + clipNote(c, range[0], range[1], "\u00b0C"));
        }
        BoardMap rise = a.riseMap();
        if (rise != null && hasFinite(rise.values())) {
            // the bar reaches the highest rise, so the hottest spot shows in the top colour and the bar's top
            // agrees with the hot spot table (both read this smoothed map)
            double[] range = percentiles(rise.values(), 0.0, 1.0);
            double upper = Math.max(range[1], 0.05);
            Plots.Grid g = grid(rise.width(), rise.height(), rise.pxPerMm(), rise.values(), boardW, boardH);
            figure(h, figs, () -> Plots.mapPng(g, new Plots.Shading(ColourMaps.EMBER, Math.min(0, Math.max(range[0], -upper)),
                            upper, false, "rise above ambient (K)"), parts, hotspots),
                    "Rise map", "Rise above ambient at the end of the series (" + ColourMaps.EMBER.word()
                            + " colour map). Rings mark the hot spots, numbered as in the hot spot table"
                            + (hotspots.stream().anyMatch(s -> s.ref() == null)
                            ? "; cyan rings are on no marked part." : ".")
                            + clipNote(rise.values(), Math.min(0, Math.max(range[0], -upper)), upper, "K"));
        }
        if (rise != null && !hasFinite(rise.values()))
            h.append("<p class=\"blank\">Rise map: no point of the board has a rise value.</p>\n");
        BoardMap onset = a.onsetMap();
        if (onset != null && hasFinite(onset.values())) {
            double[] range = percentiles(onset.values(), 0.0, 1.0);
            Plots.Grid g = grid(onset.width(), onset.height(), onset.pxPerMm(), onset.values(), boardW, boardH);
            figure(h, figs, () -> Plots.mapPng(g, new Plots.Shading(ColourMaps.TIDE, range[0], Math.max(range[1], range[0] + 1),
                            true, "onset after injection start (s)"), parts, null),
                    "Onset map", "When each point first rose above the noise threshold (" + ColourMaps.TIDE.word()
                            + " colour map, earliest lightest). The earliest region points at the source even after "
                            + "the heat has spread. Hatched: never rose.");
        } else if (onset != null) {
            h.append("<p class=\"blank\">Onset map: no point rose above the noise threshold.</p>\n");
        }
        h.append("</section>\n");

        // curves
        List<RiseCurve> curves = PartsCsv.inRankOrder(a.curves(), ranked);
        curves.removeIf(c -> c == null || c.tS() == null || c.riseK() == null);
        List<RiseCurve> shown = curves.subList(0, Math.min(CURVES_SHOWN, curves.size()));
        boolean anyCurve = shown.stream().anyMatch(c -> c.tS() != null && c.tS().length >= 2);
        if (!comparison && anyCurve) {
            h.append("<section><h2>Rise over time</h2>\n");
            Double start = r.injection() == null ? null : r.injection().startS();
            List<RiseCurve> drawn = List.copyOf(shown);
            figure(h, figs, () -> Plots.curvesPng(drawn, start), "Rise curves", "Rise above ambient of the "
                    + (shown.size() == 1 ? "leading part" : shown.size() + " leading parts") + curvesCaption(shown));
            h.append("</section>\n");
        }

        // ranking
        h.append("<section><h2>").append(comparison ? "Parts by rise" : "Ranking").append("</h2>\n");
        if (ranked.isEmpty()) {
            h.append("<p class=\"blank\">No parts are marked on this board.</p>\n");
        } else {
            h.append("<table class=\"ranking\">\n<thead><tr><th>#</th><th>part</th>");
            if (!comparison) h.append("<th>initial rate (K/s)").append(esc(rateWindowWords(r))).append("</th>");
            h.append("<th>rise (K)</th>");
            if (!comparison) h.append("<th>onset (s in the series)</th><th>\u03c4 (s)</th><th>\u0394T\u221e (K)</th><th>fit RMS (K)</th>");
            h.append("<th>noise (K)</th><th>in frame</th><th>emissivity</th><th>warnings</th></tr></thead>\n<tbody>\n");
            String leader = v == null ? null : v.ref();
            for (PartResult p : ranked) {
                h.append("<tr").append(p.ref() != null && p.ref().equals(leader) ? " class=\"leader\"" : "")
                        .append("><td>").append(p.rank()).append("</td><td class=\"ref\">").append(esc(p.ref()))
                        .append("</td>");
                if (!comparison) h.append("<td>").append(withError(p.rateKPerS(), p.rateSe())).append("</td>");
                h.append("<td>").append(fixed(p.riseK(), 2)).append("</td>");
                if (!comparison) {
                    h.append("<td>").append(fixed(p.onsetS(), 1)).append("</td><td>")
                            .append(timeConstants(p)).append("</td><td>")
                            .append(withError(p.dtInfK(), p.dtInfSe())).append("</td><td>")
                            .append(sig(p.fitRmsK(), 2)).append("</td>");
                }
                h.append("<td>").append(sig(p.noiseK(), 2)).append("</td><td>")
                        .append(p.validFraction() == null ? "\u2013" : fixed(100 * p.validFraction(), 0) + " %")
                        .append("</td><td>").append(fixed(p.emissivity(), 2)).append("</td><td class=\"warn\">");
                if (p.warnings() != null) h.append(esc(String.join("; ", p.warnings())));
                h.append("</td></tr>\n");
            }
            h.append("</tbody></table>\n");
            if (!comparison) h.append(twoConstantNotes(ranked));
        }
        h.append("</section>\n");

        // hot spots
        h.append("<section><h2>Hot spots</h2>\n");
        if (hotspots.isEmpty()) {
            h.append("<p class=\"blank\">No local maximum of the rise map stands above the noise.</p>\n");
        } else {
            h.append("<table class=\"hotspots\">\n<thead><tr><th>#</th><th>x (mm)</th><th>y (mm)</th>")
                    .append("<th>peak rise (K)</th><th>on part</th></tr></thead>\n<tbody>\n");
            for (int k = 0; k < hotspots.size(); k++) {
                Hotspot s = hotspots.get(k);
                h.append(s.ref() == null ? "<tr class=\"unmarked-row\">" : "<tr>").append("<td>#").append(k + 1)
                        .append("</td><td>").append(fixed(s.xMm(), 1)).append("</td><td>").append(fixed(s.yMm(), 1))
                        .append("</td><td>").append(fixed(s.riseK(), 2)).append("</td><td>")
                        .append(s.ref() == null ? "<strong>no marked part: mark the part there</strong>"
                                : "<span class=\"ref\">" + esc(s.ref()) + "</span>")
                        .append("</td></tr>\n");
            }
            h.append("</tbody></table>\n<p class=\"caption\">Peak rise: the highest point of the smoothed rise map"
                    + " near the spot. The ranking's rise is each part's footprint statistic (its 95th percentile) at the"
                    + " end, so a part's two numbers differ.</p>\n");
        }
        h.append("</section>\n");

        // injection
        h.append("<section><h2>Injection</h2>\n");
        Sidecar.Injection inj = r.injection();
        if (inj == null) {
            h.append("<p class=\"blank\">The series carries no injection record.</p>\n");
        } else {
            h.append("<dl class=\"facts\">\n");
            fact(h, "Positive lead on", inj.fromRail());
            fact(h, "Negative lead on", inj.toRail());
            fact(h, "Supply voltage", inj.volts() == null ? null : Html.asGiven(inj.volts()) + " V");
            fact(h, "Current limit", inj.currentLimitA() == null ? null : Html.asGiven(inj.currentLimitA()) + " A");
            fact(h, "Injection start", inj.startS() == null ? null : fixed(inj.startS(), 1) + " s into the series");
            fact(h, "Supply", inj.supply());
            fact(h, "Notes", inj.notes());
            h.append("</dl>\n");
        }
        h.append("</section>\n");
        injectionPlanSection(h, r);
        benchReadingsSection(h, r);

        // registration and frames
        h.append("<section><h2>Registration and source frames</h2>\n");
        long usable = frames.stream().filter(f -> Double.isFinite(Plots.registrationValue(f))).count();
        if (usable >= 3)
            figure(h, figs, () -> Plots.registrationPng(frames), "Registration: estimated corner error",
                    "Estimated RMS error of the four board corners per frame (corner_sigma_px: the alignment's own"
                            + " uncertainty and the check patches' implied correction, calibrated on simulated series with"
                            + " known truth); where a frame has no estimate, the check patches' residual RMS.");
        summary(h, frames);
        h.append("<table class=\"frames\">\n<thead><tr><th>#</th><th>file</th><th>t (s)</th><th>used</th>")
                .append("<th>registration</th><th>corner \u03c3 (px)</th><th>RMS (px)</th><th>reason</th><th>SHA-256</th></tr></thead>\n<tbody>\n");
        for (int k = 0; k < frames.size(); k++) {
            FrameRecord f = frames.get(k);
            FrameRecord.Registration reg = f.registration();
            String st = reg == null ? null : reg.status();
            h.append("<tr class=\"st-").append(esc(st == null ? "none" : st)).append("\"><td>").append(k + 1)
                    .append("</td><td>").append(esc(f.file())).append("</td><td>").append(fixed(f.tS(), 1))
                    .append("</td><td>").append(f.used() ? "yes" : "<strong>no</strong>").append("</td><td>")
                    .append(esc(st)).append("</td><td>").append(reg == null || reg.cornerSigmaPx() == null ? "\u2013" : fixed(reg.cornerSigmaPx(), 2))
                    .append("</td><td>").append(reg == null ? "\u2013" : fixed(reg.rmsPx(), 2))
                    .append("</td><td>").append(reg == null ? "" : esc(reg.reason())).append("</td><td class=\"hash\">")
                    .append(esc(f.sha256())).append("</td></tr>\n");
        }
        h.append("</tbody></table>\n</section>\n");

        // parameters
        h.append("<section><h2>Parameters</h2>\n");
        if (r.parameters() == null || r.parameters().isEmpty()) {
            h.append("<p class=\"blank\">No parameters recorded.</p>\n");
        } else {
            h.append("<table class=\"params\"><tbody>\n");
            ObjectMapper m = AnalysisJson.mapper();
            r.parameters().entrySet().stream().sorted(Map.Entry.comparingByKey()).forEach(e -> {
                String value;
                // the page rounds what analysis.json keeps exact: four significant figures, a dash for none
                if (e.getValue() instanceof String s) value = s;
                else if (e.getValue() == null) value = "\u2013";
                else if (e.getValue() instanceof Double || e.getValue() instanceof Float)
                    value = sig(((Number) e.getValue()).doubleValue(), 4);
                else {
                    try { value = m.writeValueAsString(e.getValue()); } catch (JsonProcessingException ex) { value = String.valueOf(e.getValue()); }
                }
                h.append("<tr><th>").append(esc(e.getKey())).append("</th><td>").append(esc(value)).append("</td></tr>\n");
            });
            h.append("</tbody></table>\n");
        }
        h.append("</section>\n");

        h.append("<footer><p>Made by ").append(esc(r.tool() == null ? "risetrace" : r.tool())).append(' ')
                .append(esc(r.version())).append(" on ").append(esc(r.createdUtc())).append(", schema ")
                .append(esc(r.schema())).append(". The numbers behind this page are in analysis.json and parts.csv ")
                .append("beside it.</p></footer>\n</main>\n</body>\n</html>\n");
        return figs.fill(h.toString());
    }

    /** The injection plan of the series' injection record (risetrace plan --write-series), when it has one. */
    static void injectionPlanSection(StringBuilder h, AnalysisResult r) {
        if (r.injection() == null || r.injection().plan() == null) return;
        h.append("<section class=\"plan\"><h2>Injection plan</h2>\n");
        InjectionPlan p;
        try {
            p = SeriesInjection.planOf(r.injection(), null);
        } catch (InputRejected e) {
            h.append("<p class=\"blank\">The series' injection plan cannot be read: ").append(esc(e.reason()))
                    .append("</p>\n</section>\n");
            return;
        }
        var in = p.inputs();
        h.append("<table class=\"params\"><tbody>\n");
        row(h, "Topology", in.topology().word() + (in.highRail() == null ? "" : ", from " + in.highRail() + " ("
                + num(in.highRailNominalV(), 3) + " V nominal) across the shorted switch") + " into " + in.rail()
                + " (" + num(in.railNominalV(), 3) + " V nominal)");
        row(h, "Measured resistance", num(in.measuredOhms(), 3) + " ohm" + (in.pathOhms() != null && in.pathOhms() > 0
                ? " (" + num(in.pathOhms(), 3) + " ohm outside the short)" : ""));
        row(h, "Supply setting", num(p.setVolts(), 3) + " V, current limit " + num(p.currentLimitA(), 3) + " A ("
                + p.mode() + ")");
        row(h, "Current", num(p.currentA(), 3) + " A, " + num(p.terminalV(), 3) + " V between the leads");
        row(h, "Power", num(p.shortPowerW(), 3) + " W in the short, " + num(p.pathPowerW(), 3) + " W elsewhere");
        for (InjectionPlan.RailVoltage v : p.rails())
            row(h, v.rail() + " against ground", (v.volts() == null ? "unchanged" : num(v.volts(), 3) + " V")
                    + ": " + v.note());
        row(h, "Heating estimate", "about " + num(p.heating().riseK(), 3) + " K after " + fixed(p.heating().afterS(), 0)
                + " s (" + num(p.heating().neededK(), 2) + " K shows clearly)");
        InjectionPlan.Capture c = p.capture();
        row(h, "Capture", "a frame every " + num(c.frameIntervalS(), 3) + " s, " + fixed(c.baselineS(), 0)
                + " s before switching on, " + fixed(c.durationS(), 0) + " s after; lock-in period "
                + num(c.lockInPeriodS(), 3) + " s, " + c.lockInCycles() + " periods");
        h.append("</tbody></table>\n");
        if (p.warnings().isEmpty()) {
            h.append("<p class=\"blank\">The plan carried no warnings.</p>\n");
        } else {
            h.append("<ul class=\"plan-warnings\">\n");
            for (PlanWarning w : p.warnings())
                h.append("<li class=\"sev-").append(esc(w.severity())).append("\"><strong>").append(esc(w.code().word()))
                        .append("</strong> (").append(esc(w.severity())).append("): ").append(esc(w.message())).append("</li>\n");
            h.append("</ul>\n");
        }
        h.append("</section>\n");
    }

    /** The series folder's bench meter readings (readings.csv), outliers highlighted, when there are any. */
    static void benchReadingsSection(StringBuilder h, AnalysisResult r) {
        BenchReadings b = r.benchReadings();
        if (b == null) return;
        h.append("<section class=\"readings\"><h2>Bench readings</h2>\n");
        for (String f : b.findings()) h.append("<p class=\"finding\">").append(esc(f)).append("</p>\n");
        h.append("<table class=\"readings\">\n<thead><tr><th>what</th><th>where</th><th>reading</th><th>instrument</th>")
                .append("<th>f (kHz)</th><th>L (\u00b5H)</th><th>group median</th><th>modified z</th>")
                .append("<th>ideal</th><th>ratio</th><th></th></tr></thead>\n<tbody>\n");
        for (BenchReadings.Row row : b.rows()) {
            h.append(row.outlier() ? "<tr class=\"outlier-row\">" : "<tr>").append("<td>").append(esc(row.what()))
                    .append("</td><td class=\"ref\">").append(esc(row.where())).append("</td><td>")
                    .append(java.math.BigDecimal.valueOf(row.value()).stripTrailingZeros().toPlainString()).append(' ').append(esc(row.unit())).append("</td><td>")
                    .append(esc(row.instrument())).append("</td><td>")
                    .append(row.frequencyHz() == null ? "" : num(row.frequencyHz() / 1000, 4)).append("</td><td>")
                    .append(row.inductanceUh() == null ? "" : num(row.inductanceUh(), 4)).append("</td><td>")
                    .append(row.groupMedian() == null ? "" : num(row.groupMedian(), 3) + " " + esc(row.unit()))
                    .append("</td><td>").append(row.modifiedZ() == null ? "" : fixed(row.modifiedZ(), 1))
                    .append("</td><td>").append(row.expected() == null ? "" : num(row.expected(), 3) + " " + esc(row.unit()))
                    .append("</td><td>").append(row.ratioToExpected() == null ? "" : num(row.ratioToExpected(), 2))
                    .append("</td><td>").append(row.outlier() ? "<strong>outlier</strong>" : "").append("</td></tr>\n");
        }
        h.append("</tbody></table>\n<p class=\"blank\">Like readings (same what, same unit) are compared by the "
                + "modified z-score 0.6745 (x \u2212 median) / MAD; beyond 3.5 a reading is an outlier (Iglewicz and "
                + "Hoaglin 1993). Ideal: the reactance 2\u03c0fL of the rated inductance.</p>\n</section>\n");
    }

    /** {@code digits} significant figures without trailing zeros (the planning sections' numbers); a dash when absent. */
    static String num(Double v, int digits) {
        if (v == null || !Double.isFinite(v)) return "\u2013";
        if (v == 0) return "0";
        String t = new java.math.BigDecimal(v).round(new java.math.MathContext(digits, java.math.RoundingMode.HALF_EVEN))
                .stripTrailingZeros().toPlainString();
        return t.startsWith("-") ? "\u2212" + t.substring(1) : t;
    }

    private static void row(StringBuilder h, String term, String value) {
        h.append("<tr><th>").append(esc(term)).append("</th><td>").append(esc(value)).append("</td></tr>\n");
    }

    private static void summary(StringBuilder h, List<FrameRecord> frames) {
        int ok = 0, weak = 0, failed = 0, marked = 0;
        for (FrameRecord f : frames) {
            String s = f.registration() == null ? "" : String.valueOf(f.registration().status());
            switch (s) {
                case "ok" -> ok++;
                case "weak" -> weak++;
                case "failed" -> failed++;
                case "marked" -> marked++;
                default -> { }
            }
        }
        h.append("<p>").append(ok).append(" ok, ").append(marked).append(" marked by hand, ").append(weak)
                .append(" weak, ").append(failed).append(" failed (left out).")
                .append(weak > 0 ? " Weak frames were used, but their mapping is marginal." : "").append("</p>\n");
    }

    // ---- the rise model in the curves' caption and the ranking table ----

    /**
     * What the rise plot draws, part by part: dots are measured; the dashed line is the model chosen for that part
     * (one or two time constants), and a part without one says why.
     */
    static String curvesCaption(List<RiseCurve> shown) {
        StringBuilder one = new StringBuilder(), two = new StringBuilder(), none = new StringBuilder();
        for (RiseCurve c : shown) {
            StringBuilder to = c.fit() == null ? none : c.fit().isDouble() ? two : one;
            to.append(to.length() == 0 ? "" : ", ").append(c.ref());
        }
        StringBuilder s = new StringBuilder("; dots: measured");
        if (one.length() + two.length() > 0) s.append("; dashed: the fitted rise model from the injection start t0");
        if (two.length() > 0)
            s.append(", two time constants \u0394T1\u00b7(1 \u2212 exp(\u2212(t \u2212 t0)/\u03c41)) + "
                    + "\u0394T2\u00b7(1 \u2212 exp(\u2212(t \u2212 t0)/\u03c42)) for ").append(two);
        if (one.length() > 0)
            s.append(two.length() > 0 ? ";" : ",")
                    .append(" one time constant \u0394T\u221e\u00b7(1 \u2212 exp(\u2212(t \u2212 t0)/\u03c4)) for ")
                    .append(one);
        if (none.length() > 0)
            s.append("; no fit for ").append(none)
                    .append(" (no onset above the noise, or a curve the series does not determine)");
        return s.append('.').toString();
    }

    /** Below the ranking: each two-constant model in full (the table has room for the time constants only). */
    static String twoConstantNotes(List<PartResult> ranked) {
        StringBuilder s = new StringBuilder();
        for (PartResult p : ranked) {
            if (p.fit() == null || !p.fit().isDouble()) continue;
            org.risetrace.analysis.RiseModelFit f = p.fit();
            org.risetrace.analysis.RiseModelFit.Term a = f.terms().get(0), b = f.terms().get(1);
            s.append(s.length() == 0 ? "" : "; ").append(esc(p.ref())).append(": \u0394T1 = ")
                    .append(withError(a.dtK(), a.dtSe())).append(" K, \u03c41 = ").append(withError(a.tauS(), a.tauSe()))
                    .append(" s; \u0394T2 = ").append(withError(b.dtK(), b.dtSe())).append(" K, \u03c42 = ")
                    .append(withError(b.tauS(), b.tauSe())).append(" s (")
                    .append(esc(f.selection().replaceFirst("^two time constants \\((.*)\\)$", "$1"))).append(')');
        }
        if (s.length() == 0) return "";
        return "<p class=\"fits\">Two time constants, \u0394T\u221e = \u0394T1 + \u0394T2: "
                + s + ".</p>\n";
    }

    /** The time constants of a part's model with their errors: one, or "fast and slow". */
    static String timeConstants(PartResult p) {
        if (p.fit() == null || !p.fit().isDouble()) return withError(p.tauS(), p.tauSe());
        StringBuilder s = new StringBuilder();
        for (org.risetrace.analysis.RiseModelFit.Term t : p.fit().terms())
            s.append(s.length() == 0 ? "" : " and ").append(withError(t.tauS(), t.tauSe()));
        return s.toString();
    }

    /** An ISO-8601 instant as "2026-12-01 23:40:00 UTC"; anything else unchanged. */
    static String readableTime(String iso) {
        if (iso == null) return null;
        try {
            java.time.Instant t = java.time.Instant.parse(iso).truncatedTo(java.time.temporal.ChronoUnit.SECONDS);
            return t.toString().replace('T', ' ').replace("Z", " UTC");
        } catch (java.time.format.DateTimeParseException e) {
            return iso;
        }
    }

    private static String titleOf(Analysis a) {
        String name = a.board() != null && a.board().name() != null ? a.board().name() : "board";
        return "risetrace report: " + name;
    }

    private static void fact(StringBuilder h, String term, String value) {
        if (value == null || value.isBlank()) return;
        h.append("<div><dt>").append(esc(term)).append("</dt><dd>").append(esc(value)).append("</dd></div>\n");
    }

    /** A figure whose PNG is rendered beside the rest of the page (see {@link Figures}). */
    private static void figure(StringBuilder h, Figures figs, java.util.concurrent.Callable<byte[]> png, String alt,
                               String caption) {
        h.append("<figure><img alt=\"").append(esc(alt)).append("\" width=\"").append(Plots.WIDTH_PX)
                .append("\" src=\"data:image/png;base64,").append(figs.add(png))
                .append("\"><figcaption>").append(esc(caption)).append("</figcaption></figure>\n");
    }

    private static Plots.Grid grid(int w, int hgt, double pxPerMm, float[] values, double boardW, double boardH) {
        double bw = Double.isFinite(boardW) && boardW > 0 ? boardW : w / pxPerMm;
        double bh = Double.isFinite(boardH) && boardH > 0 ? boardH : hgt / pxPerMm;
        return new Plots.Grid(w, hgt, pxPerMm, values, bw, bh);
    }

    private static boolean hasFinite(float[] v) {
        if (v == null) return false;
        for (float f : v) if (Float.isFinite(f)) return true;
        return false;
    }

    /**
     * The caption's words when a colour bar does not span every value: how many points lie beyond its ends and that
     * they show the end colours; empty when none do.
     */
    static String clipNote(float[] values, double lo, double hi, String unit) {
        int n = 0, below = 0, above = 0;
        for (float v : values) {
            if (!Float.isFinite(v)) continue;
            n++;
            if (v < lo) below++;
            else if (v > hi) above++;
        }
        if (n == 0 || below + above == 0) return "";
        return String.format(java.util.Locale.ROOT, " The colour bar is clipped to %s to %s %s: %s of the points lie"
                        + " beyond it and show its end colours (%d below, %d above).", sig(lo, 3), sig(hi, 3), unit,
                100.0 * (below + above) / n < 0.1 ? "under 0.1 %" : fixed(100.0 * (below + above) / n, 1) + " %",
                below, above);
    }

    /** Lower and upper percentiles (fractions) of the finite values; [0, 1] when there are none. */
    static double[] percentiles(float[] values, double lo, double hi) {
        float[] f = new float[values.length];
        int n = 0;
        for (float v : values) if (Float.isFinite(v)) f[n++] = v;
        if (n == 0) return new double[]{0, 1};
        Arrays.sort(f, 0, n);
        double a = f[(int) Math.floor(lo * (n - 1))], b = f[(int) Math.ceil(hi * (n - 1))];
        if (!(b > a)) b = a + 1e-3;
        return new double[]{a, b};
    }

    private static PartResult part(AnalysisResult r, String ref) {
        if (r.parts() == null) return null;
        for (PartResult p : r.parts()) if (ref.equals(p.ref())) return p;
        return null;
    }

    private static boolean finite(Double d) {
        return d != null && Double.isFinite(d);
    }

    /** Plain, calm styles; A4 print rules. No external fonts or references. */
    private static final String CSS = String.join("\n",
            ":root { --ink: #1d232a; --muted: #5b6570; --rule: #d5d9de; --paper: #ffffff; --tint: #f4f5f7; }",
            "* { box-sizing: border-box; }",
            "body { margin: 0; background: #eceef1; color: var(--ink);",
            "  font: 15px/1.45 \"DejaVu Sans\", \"Liberation Sans\", Arial, sans-serif; }",
            "main { max-width: 980px; margin: 0 auto; padding: 28px 36px 40px; background: var(--paper); }",
            "h1 { font-size: 26px; margin: 2px 0 12px; }",
            "h2 { font-size: 18px; margin: 30px 0 10px; padding-bottom: 4px; border-bottom: 1px solid var(--rule); }",
            ".kicker { margin: 0; color: var(--muted); text-transform: uppercase; letter-spacing: 0.08em; font-size: 12px; }",
            "dl.facts { display: grid; grid-template-columns: repeat(auto-fill, minmax(400px, 1fr)); gap: 4px 24px; margin: 0; }",
            "dl.facts div { display: flex; gap: 8px; }",
            "dt { color: var(--muted); min-width: 9em; }",
            "dd { margin: 0; word-break: break-word; }",
            ".notes h2 { font-size: 15px; margin-top: 16px; }",
            ".pre { white-space: pre-wrap; margin: 4px 0; }",
            ".label { color: var(--muted); }",
            ".blank { color: var(--muted); font-style: italic; }",
            ".writein { display: none; }",
            ".verdict { margin: 22px 0 0; padding: 14px 18px; border-left: 8px solid #7a8591; background: var(--tint); }",
            ".verdict.status-identified { border-color: #1f6f50; }",
            ".verdict.status-inconclusive { border-color: #b07a12; }",
            ".verdict .status { margin: 0; text-transform: uppercase; letter-spacing: 0.08em; font-size: 12px; color: var(--muted); }",
            ".verdict .headline { margin: 4px 0 0; font-size: 24px; font-weight: bold; line-height: 1.25; }",
            ".verdict .reason { margin: 6px 0 0; color: var(--muted); }",
            ".verdict .unmarked { margin: 10px 0 0; padding: 8px 10px; background: #fff4d6; border: 1px solid #e0b84c; font-weight: bold; }",
            ".safety { margin: 16px 0 0; padding: 10px 16px; border: 1px solid #c9a23f; background: #fffaf0; }",
            ".safety h2 { margin: 0 0 4px; border: none; font-size: 15px; }",
            ".safety p { margin: 0; }",
            "figure { margin: 14px 0 18px; }",
            "figure img { display: block; max-width: 100%; height: auto; border: 1px solid var(--rule); }",
            "figcaption, p.caption { color: var(--muted); font-size: 13px; margin-top: 4px; }",
            "table { border-collapse: collapse; width: 100%; font-size: 13px; }",
            "th, td { padding: 4px 6px; border-bottom: 1px solid var(--rule); text-align: left; vertical-align: top; }",
            "thead th { background: var(--tint); font-weight: bold; }",
            "td { font-variant-numeric: tabular-nums; }",
            "table.ranking td:not(.warn), table.hotspots td { white-space: nowrap; }",
            // eleven columns of numbers kept on one line each: a little tighter, so they fit the page at 1280 px
            "table.ranking { font-size: 12px; }",
            "table.ranking th, table.ranking td { padding: 4px 4px; }",
            ".ref { font-weight: bold; }",
            "tr.leader td { background: #e3f1ea; }",
            "tr.unmarked-row td { background: #fff4d6; }",
            "tr.outlier-row td { background: #f6dede; }",
            ".finding { margin: 4px 0; font-weight: bold; }",
            "ul.plan-warnings li.sev-stop { color: #8a1f1f; font-weight: bold; }",
            "td.warn { color: #8a4b00; }",
            "table.frames { font-size: 12px; }",
            "td.hash { font-family: \"DejaVu Sans Mono\", \"Liberation Mono\", monospace; font-size: 10px; white-space: nowrap; }",
            "tr.st-weak td { background: #fff4d6; }",
            "tr.st-failed td { background: #f6dede; }",
            "table.params th { width: 40%; font-weight: normal; color: var(--muted); }",
            "footer { margin-top: 30px; color: var(--muted); font-size: 12px; border-top: 1px solid var(--rule); padding-top: 8px; }",
            "@page { size: A4; margin: 14mm 12mm; }",
            "@media print {",
            "  body { background: none; font-size: 10pt; }",
            "  main { max-width: none; padding: 0; }",
            "  .writein { display: block; height: 28mm; border: 1px solid var(--rule); }",
            "  figure, tr, .verdict, .safety { break-inside: avoid; }",
            "  h2 { break-after: avoid; }",
            "  table.frames { font-size: 7.5pt; }",
            "  td.hash { font-size: 6.2pt; }",
            "  table.ranking { font-size: 8pt; }",
            "  .verdict, tr.leader td, tr.unmarked-row td, tr.outlier-row td, tr.st-weak td, tr.st-failed td, thead th {",
            "    -webkit-print-color-adjust: exact; print-color-adjust: exact; }",
            "}",
            "");
}
