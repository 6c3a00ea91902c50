package org.risetrace.report;

import org.jfree.chart.ChartRenderingInfo;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.ui.RectangleEdge;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.AnalysisResult;
import org.risetrace.analysis.FrameRecord;
import org.risetrace.analysis.PartResult;
import org.risetrace.analysis.RiseCurve;
import org.risetrace.analysis.Verdict;
import org.risetrace.analysis.VerdictStatus;
import org.risetrace.board.Board;
import org.risetrace.board.Part;
import org.risetrace.io.Sidecar;

import javax.imageio.ImageIO;
import java.awt.geom.Rectangle2D;
import java.awt.image.BufferedImage;
import java.io.ByteArrayInputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Base64;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** report.html: self-contained, complete, and safe with hostile text. */
class ReportHtmlTest {
    private static final Pattern DATA_URI = Pattern.compile("data:image/png;base64,([A-Za-z0-9+/=]+)");

    private static String html(Analysis a) {
        return ReportHtml.toHtml(a, "Customer says: no power after a spill.");
    }

    private static String withoutDataUris(String html) {
        return DATA_URI.matcher(html).replaceAll("data:");
    }

    @Test
    void pageOpensOfflineWithNothingFetched() {
        String page = withoutDataUris(html(DemoAnalysis.build()));
        for (String forbidden : new String[]{"http://", "https://", "src=\"/", "//", "<script", "<link", "url(",
                "@import", "<iframe", "<object", "<embed"})
            assertFalse(page.contains(forbidden), "report refers outside itself: " + forbidden);
        // every src is a data URI
        Matcher m = Pattern.compile("src=\"([^\"]*)\"").matcher(page);
        while (m.find()) assertTrue(m.group(1).startsWith("data:"), m.group(1));
    }

    @Test
    void verdictDesignatorsSafetyAndHashesAreAllThere() {
        Analysis a = DemoAnalysis.build();
        String page = html(a);
        assertTrue(page.contains("Q3 heats fastest: 0.20 K/s, 7.9 sigma ahead of Q5"), "headline");
        assertTrue(page.contains(ReportHtml.SAFETY_TEXT.replace("'", "&#39;")), "safety text");
        assertTrue(page.contains("current limit"));
        int table = page.indexOf("<table class=\"ranking\">");
        String ranking = page.substring(table, page.indexOf("</table>", table));
        for (PartResult p : a.result().parts())
            assertTrue(ranking.contains("<td class=\"ref\">" + p.ref() + "</td>"), "ranking lacks " + p.ref());
        for (FrameRecord f : a.result().frames()) {
            assertTrue(page.contains(f.sha256()), "hash of " + f.file());
            assertTrue(page.contains(f.file()));
        }
        assertTrue(page.contains("RT-7 bench board"));
        assertTrue(page.contains("cases/rt7-bench/series-01"));
        assertTrue(page.contains("2026-12-01 23:40:00 UTC"), "analysis time in the header");
        assertEquals("2026-12-01 23:31:25 UTC", ReportHtml.readableTime("2026-12-01T23:31:25.811668625Z"));
        assertEquals("yesterday", ReportHtml.readableTime("yesterday"));
        assertFalse(page.contains("could not be mapped onto the board"), "1 of 60 failed is no headline matter");
        assertTrue(page.contains("Customer says: no power after a spill."));
        assertTrue(page.contains("clip on the output capacitor bank"), "injection notes");
        assertTrue(page.contains("VCORE") && page.contains("3 A"), "injection record");
        assertTrue(page.contains("too few board features matched"), "reason of the failed frame");
        assertTrue(page.contains("@media print") && page.contains("size: A4"), "print rules");
    }

    @Test
    void embeddedImagesArePngsOfTheExpectedSize() throws Exception {
        String page = html(DemoAnalysis.build());
        Matcher m = DATA_URI.matcher(page);
        List<int[]> sizes = new ArrayList<>();
        while (m.find()) {
            byte[] png = Base64.getDecoder().decode(m.group(1));
            // PNG signature, ISO/IEC 15948 section 5.2
            assertArrayEquals(new byte[]{(byte) 0x89, 'P', 'N', 'G', 0x0d, 0x0a, 0x1a, 0x0a},
                    java.util.Arrays.copyOf(png, 8));
            BufferedImage img = ImageIO.read(new ByteArrayInputStream(png));
            assertNotNull(img);
            sizes.add(new int[]{img.getWidth(), img.getHeight()});
        }
        int mapH = Plots.mapHeightPx(DemoAnalysis.BOARD_W_MM, DemoAnalysis.BOARD_H_MM);
        // last frame, rise map, onset map, rise curves, registration residual
        assertEquals(5, sizes.size());
        int[][] expected = {{Plots.WIDTH_PX, mapH}, {Plots.WIDTH_PX, mapH}, {Plots.WIDTH_PX, mapH},
                {Plots.WIDTH_PX, Plots.CURVES_HEIGHT_PX}, {Plots.WIDTH_PX, Plots.RMS_HEIGHT_PX}};
        for (int k = 0; k < 5; k++) assertArrayEquals(expected[k], sizes.get(k), "image " + k);
    }

    @Test
    void mapShowsBoardYRunningDownAndColoursByValue() {
        // a 40 x 30 mm grid at 2 px/mm, warm (5 K) only in its top-left quarter
        int w = 80, h = 60;
        float[] v = new float[w * h];
        for (int j = 0; j < h; j++) for (int i = 0; i < w; i++) v[j * w + i] = (i < w / 2 && j < h / 2) ? 5f : 0f;
        Plots.Grid grid = new Plots.Grid(w, h, 2.0, v, 40, 30);
        JFreeChart chart = Plots.mapChart(grid, new Plots.Shading(ColourMaps.EMBER, 0, 5, false, "K"), List.of(), null);
        ChartRenderingInfo info = new ChartRenderingInfo();
        BufferedImage img = chart.createBufferedImage(Plots.WIDTH_PX, Plots.mapHeightPx(40, 30), info);
        Rectangle2D area = info.getPlotInfo().getDataArea();
        XYPlot plot = chart.getXYPlot();
        int[] top = pixelAt(img, plot, area, 10, 7.5);     // board (10, 7.5) mm: in the warm quarter
        int[] bottom = pixelAt(img, plot, area, 10, 22.5); // board (10, 22.5) mm: cool
        // the warm quarter is drawn in the map's top colour, up in the picture, since board y runs down
        int hot = ColourMaps.EMBER.rgb(1), cold = ColourMaps.EMBER.rgb(0);
        assertTrue(close(top, hot), "top-left should be the hottest colour");
        assertTrue(close(bottom, cold), "bottom-left should be the coldest colour");
        double yTop = plot.getRangeAxis().valueToJava2D(7.5, area, RectangleEdge.LEFT);
        double yBottom = plot.getRangeAxis().valueToJava2D(22.5, area, RectangleEdge.LEFT);
        assertTrue(yTop < yBottom, "y axis inverted: smaller board y is higher on the page");
    }

    @Test
    void fineMapsAreAveragedIntoAtMost240BlocksAcross() {
        int w = 1000, h = 500;  // 100 x 50 mm at 10 px/mm
        float[] v = new float[w * h];
        for (int i = 0; i < v.length; i++) v[i] = (i % w) < w / 2 ? 1f : 3f;
        BufferedImage img = Plots.mapImage(new Plots.Grid(w, h, 10.0, v, 100, 50),
                new Plots.Shading(ColourMaps.EMBER, 0, 3, false, "K"));
        int bin = 5; // by hand: whole-pixel square blocks, the smallest that keep 1000 px within 240 across (4 px would give 250)
        assertEquals(200, img.getWidth());
        assertEquals(100, img.getHeight());
        // a bin's value is the mean of its pixels: the bins left of x = 50 mm hold 1 K, right of it 3 K, coloured
        // through the colour map's table at (value - lower) / (upper - lower)
        int one = ColourMaps.EMBER.rgb(1 / 3.0), three = ColourMaps.EMBER.rgb(1.0);
        for (int bj = 0; bj < img.getHeight(); bj++)
            for (int bi = 0; bi < img.getWidth(); bi++) {
                double xMm = (bi + 0.5) * bin / 10.0;
                assertEquals(0xff000000 | (xMm < 50 ? one : three), img.getRGB(bi, bj), "bin at x = " + xMm);
            }
    }

    @Test
    void mapBinsWithoutValueAreTransparentSoTheHatchingShows() {
        int w = 20, h = 10;
        float[] v = new float[w * h];
        java.util.Arrays.fill(v, Float.NaN);
        v[0] = 2f;  // one cell with a value
        BufferedImage img = Plots.mapImage(new Plots.Grid(w, h, 2.0, v, 10, 5),
                new Plots.Shading(ColourMaps.TIDE, 0, 4, true, "s"));
        assertEquals(0xff000000 | ColourMaps.TIDE.rgb(0.5), img.getRGB(0, 0));  // reversed: 1 - 0.5
        assertEquals(0, img.getRGB(1, 0) >>> 24, "no value: fully transparent");
        assertEquals(0, img.getRGB(w - 1, h - 1) >>> 24);
    }

    private static int[] pixelAt(BufferedImage img, XYPlot plot, Rectangle2D area, double xMm, double yMm) {
        int px = (int) Math.round(plot.getDomainAxis().valueToJava2D(xMm, area, RectangleEdge.BOTTOM));
        int py = (int) Math.round(plot.getRangeAxis().valueToJava2D(yMm, area, RectangleEdge.LEFT));
        int rgb = img.getRGB(px, py);
        return new int[]{rgb >> 16 & 0xff, rgb >> 8 & 0xff, rgb & 0xff};
    }

    private static boolean close(int[] rgb, int expected) {
        return Math.abs(rgb[0] - (expected >> 16 & 0xff)) <= 3 && Math.abs(rgb[1] - (expected >> 8 & 0xff)) <= 3
                && Math.abs(rgb[2] - (expected & 0xff)) <= 3;
    }

    @Test
    void hostileDesignatorsAndNotesCannotInjectMarkup() {
        Analysis a = DemoAnalysis.build();
        AnalysisResult r = a.result();
        List<PartResult> parts = new ArrayList<>(r.parts());
        PartResult p = parts.get(1);
        String evil = "<b>X1</b>";
        parts.set(1, new PartResult(evil, p.rank(), p.rateKPerS(), p.rateSe(), p.riseK(), p.onsetS(), p.tauS(),
                p.tauSe(), p.dtInfK(), p.dtInfSe(), p.fitRmsK(), p.noiseK(), p.validFraction(), p.emissivity(),
                List.of("<img src=x onerror=alert(1)>")));
        Sidecar.Injection inj = new Sidecar.Injection(10.0, "V\"CC", "GND", 1.0, 2.0, "x",
                "</p><script>alert('n')</script>");
        AnalysisResult hostile = new AnalysisResult(r.schema(), r.tool(), r.version(), r.createdUtc(),
                "folder/<i>s</i>", r.board(), r.profile(), r.parameters(), inj,
                new Verdict(VerdictStatus.IDENTIFIED, "Q3", 0.2, evil, 7.9, "ok & <u>sure</u>"), parts,
                r.hotspots(), r.frames());
        List<RiseCurve> curves = new ArrayList<>(a.curves());
        RiseCurve c = curves.get(1);
        curves.set(1, new RiseCurve(evil, c.tS(), c.riseK(), c.onsetS(), c.fit()));
        String page = ReportHtml.toHtml(new Analysis(hostile, a.board(), curves, a.riseMap(), a.onsetMap(),
                a.lastFrame()), "notes <script>x()</script> & more");
        // OWASP XSS Prevention Cheat Sheet, rule 1: HTML-encode untrusted data in element content
        for (String raw : new String[]{"<b>X1</b>", "<script>", "<img src=x", "<i>s</i>", "<u>sure</u>", "V\"CC"})
            assertFalse(page.contains(raw), "unescaped: " + raw);
        assertTrue(page.contains("&lt;b&gt;X1&lt;/b&gt;"));
        assertTrue(page.contains("notes &lt;script&gt;x()&lt;/script&gt; &amp; more"));
        assertTrue(page.contains("V&quot;CC"));
        assertFalse(page.contains("<script"));
    }

    @Test
    void manyFailedFramesAreSaidNextToTheVerdict() {
        Analysis a = DemoAnalysis.build();
        AnalysisResult r = a.result();
        List<FrameRecord> frames = new ArrayList<>();
        for (int i = 0; i < r.frames().size(); i++) {
            FrameRecord f = r.frames().get(i);
            boolean fail = i >= 20;
            frames.add(fail ? new FrameRecord(f.file(), f.tS(), f.sha256(), false,
                    new FrameRecord.Registration("failed", 0.5, "image similarity too low", null)) : f);
        }
        AnalysisResult worse = new AnalysisResult(r.schema(), r.tool(), r.version(), r.createdUtc(), r.series(),
                r.board(), r.profile(), r.parameters(), r.injection(), r.verdict(), r.parts(), r.hotspots(), frames);
        String page = ReportHtml.toHtml(new Analysis(worse, a.board(), a.curves(), a.riseMap(), a.onsetMap(),
                a.lastFrame()), null);
        int verdict = page.indexOf("<section class=\"verdict");
        int warning = page.indexOf("40 of 60 frames could not be mapped onto the board and were left out; "
                + "the answer rests on 20 frames.");
        assertTrue(warning > verdict && warning < page.indexOf("</section>", verdict), "warning inside the verdict box");
    }

    @Test
    void unmarkedHottestSpotAsksForTheMissingPart() {
        String page = html(DemoAnalysis.build(true, false));
        assertTrue(page.contains("Inconclusive: the hottest spot is on no marked part"));
        // said once (issue 17): the verdict's reason already asks for the part, so the extra sentence is left out
        assertFalse(page.contains("The hottest spot, at 56.0, 30.0 mm, is on no marked part: mark the part there."));
        assertFalse(page.contains("class=\"leader\""), "no marked part is highlighted as the answer");
        assertTrue(page.contains("class=\"unmarked-row\""));
    }

    @Test
    void beforeAfterPairRanksByRiseWithoutRates() throws Exception {
        Analysis a = DemoAnalysis.build(false, true);
        String page = html(a);
        assertTrue(ReportHtml.isComparison(a));
        assertTrue(page.contains("Q3 rose most: "), ReportHtml.headline(a));
        assertFalse(page.contains("initial rate"), "no rate column for two frames");
        assertFalse(page.contains("Rise over time"), "no curves for two frames");
        Matcher m = DATA_URI.matcher(page);
        int images = 0;
        while (m.find()) images++;
        assertEquals(3, images, "three maps, no curves, no residual plot for two frames");
    }

    @Test
    void headlinesSayWhatTheStatusMeans() {
        Analysis a = DemoAnalysis.build();
        AnalysisResult r = a.result();
        Analysis none = withVerdict(a, new Verdict(VerdictStatus.NO_HEATING, null, null, null, null,
                "no part rose above 3 sigma"));
        assertEquals("No part heats above the noise: no part rose above 3 sigma", ReportHtml.headline(none));
        Analysis level = withVerdict(a, new Verdict(VerdictStatus.INCONCLUSIVE, "Q3", 0.2, "Q5", 1.2,
                "Q3 and Q5 are level within 1.2 sigma"));
        assertEquals("Inconclusive: Q3 and Q5 are level within 1.2 sigma", ReportHtml.headline(level));
        assertEquals("Q3 heats fastest: 0.20 K/s, 7.9 sigma ahead of Q5", ReportHtml.headline(a));
        assertEquals(r.verdict().ref(), "Q3");
        // with the window the rates were fitted over recorded, the headline says the rate is over that window
        java.util.Map<String, Object> params = new java.util.LinkedHashMap<>(r.parameters());
        params.put("rate_window_used_s", 6.0);
        Analysis windowed = new Analysis(new AnalysisResult(r.schema(), r.tool(), r.version(), r.createdUtc(),
                r.series(), r.board(), r.profile(), params, r.injection(), r.verdict(), r.parts(), r.hotspots(),
                r.frames()), a.board(), a.curves(), a.riseMap(), a.onsetMap(), a.lastFrame());
        assertEquals("Q3 heats fastest: 0.20 K/s over the first 6 s, 7.9 sigma ahead of Q5",
                ReportHtml.headline(windowed));
        assertTrue(ReportHtml.toHtml(windowed, null).contains("initial rate (K/s) over the first 6 s"));
        // the parameters table rounds what analysis.json keeps exact, and shows a dash for a value not recorded
        params.put("zz_ratio", 2.3972970917690457);
        params.put("zz_none", null);
        String page = ReportHtml.toHtml(new Analysis(new AnalysisResult(r.schema(), r.tool(), r.version(),
                r.createdUtc(), r.series(), r.board(), r.profile(), params, r.injection(), r.verdict(), r.parts(),
                r.hotspots(), r.frames()), a.board(), a.curves(), a.riseMap(), a.onsetMap(), a.lastFrame()), null);
        assertTrue(page.contains("<th>zz_ratio</th><td>2.397</td>"), "four significant figures");
        assertTrue(page.contains("<th>zz_none</th><td>\u2013</td>"), "a dash, not null");
        // what a user typed into series.json is shown as typed, not padded to four figures ("0.4000 V")
        assertEquals("0.4", Html.asGiven(0.4));
        assertEquals("3", Html.asGiven(3.0));
        assertEquals("\u22121.5", Html.asGiven(-1.50));
        assertEquals("0.125", Html.asGiven(0.125));
    }

    private static Analysis withVerdict(Analysis a, Verdict v) {
        AnalysisResult r = a.result();
        return new Analysis(new AnalysisResult(r.schema(), r.tool(), r.version(), r.createdUtc(), r.series(),
                r.board(), r.profile(), r.parameters(), r.injection(), v, r.parts(), r.hotspots(), r.frames()),
                a.board(), a.curves(), a.riseMap(), a.onsetMap(), a.lastFrame());
    }

    @Test
    void sparseAnalysisStillGivesAReport(@TempDir Path dir) throws Exception {
        // no board, no maps, no curves, no frames: the report still states the verdict
        AnalysisResult r = new AnalysisResult(AnalysisResult.SCHEMA, "risetrace", "dev", "2026-12-01T00:00:00Z",
                "s", null, null, null, null, new Verdict(VerdictStatus.NO_HEATING, null, null, null, null,
                "nothing rose"), List.of(), List.of(), List.of());
        Analysis a = new Analysis(r, null, List.of(), null, null, null);
        Reports.writeAll(a, dir.resolve("out"));
        String page = Files.readString(dir.resolve("out").resolve(Reports.HTML_FILE));
        assertTrue(page.contains("No part heats above the noise: nothing rose"));
        assertTrue(page.contains("No notes were recorded"));
        assertEquals("t_s\r\n", Files.readString(dir.resolve("out").resolve(Reports.CSV_FILE)));
        // the JSON is the same sparse result, read back field by field (not merely "longer than 100 bytes")
        com.fasterxml.jackson.databind.JsonNode json = new com.fasterxml.jackson.databind.ObjectMapper()
                .readTree(dir.resolve("out").resolve(Reports.JSON_FILE).toFile());
        assertEquals(AnalysisResult.SCHEMA, json.get("schema").asText());
        assertEquals("no-heating", json.get("verdict").get("status").asText());
        assertEquals("nothing rose", json.get("verdict").get("reason").asText());
        assertTrue(json.get("verdict").get("ref").isNull() && json.get("board").isNull());
        assertEquals(0, json.get("parts").size());
        assertEquals(0, json.get("frames").size());
    }

    @Test
    void rotatedPartOutlineMatchesTheFootprintTest() {
        // the drawn outline and Part.contains must agree: corners drawn lie on the footprint's boundary
        Part p = new Part("U3", null, null, 60, 20, 9, 4, 30.0);
        java.awt.geom.PathIterator it = Plots.partOutline(p).getPathIterator(null);
        double[] c = new double[6];
        int corners = 0;
        while (!it.isDone()) {
            int type = it.currentSegment(c);
            if (type != java.awt.geom.PathIterator.SEG_CLOSE) {
                corners++;
                // a point just inside the corner (towards the centre) is in, just outside is out
                double ix = c[0] + (p.xMm() - c[0]) * 0.01, iy = c[1] + (p.yMm() - c[1]) * 0.01;
                double ox = c[0] - (p.xMm() - c[0]) * 0.01, oy = c[1] - (p.yMm() - c[1]) * 0.01;
                assertTrue(p.contains(ix, iy));
                assertFalse(p.contains(ox, oy));
            }
            it.next();
        }
        assertEquals(4, corners);
        Board b = DemoAnalysis.build().board();
        assertEquals(10, b.partsOrEmpty().size());
    }

    @Test
    void unmarkedSpotSentenceStaysWhenTheVerdictIsAboutSomethingElse() {
        // an identified leader while the hottest spot (within the optics' margin of a part) carries no part: the
        // sentence asking for the part is then the only place it is said
        Analysis a = DemoAnalysis.build(true, false);
        AnalysisResult r = a.result();
        Verdict identified = new Verdict(VerdictStatus.IDENTIFIED, "Q3", 0.2, "Q5", 7.9, "Q3 heats fastest");
        AnalysisResult other = new AnalysisResult(r.schema(), r.tool(), r.version(), r.createdUtc(), r.series(),
                r.board(), r.profile(), r.parameters(), r.injection(), identified, r.parts(), r.hotspots(), r.frames());
        String page = ReportHtml.toHtml(new Analysis(other, a.board(), a.curves(), a.riseMap(), a.onsetMap(),
                a.lastFrame()), null);
        assertTrue(page.contains("The hottest spot, at 56.0, 30.0 mm, is on no marked part: mark the part there."));
        assertTrue(page.contains("class=\"leader\""));
    }

    @Test
    void seriesWithOneUsableFrameIsNotCalledAComparison() {
        // issue 17: a 60-frame series with all but one frame failed read "before/after comparison"
        Analysis a = DemoAnalysis.build();
        AnalysisResult r = a.result();
        List<FrameRecord> frames = new ArrayList<>();
        for (int i = 0; i < r.frames().size(); i++) {
            FrameRecord f = r.frames().get(i);
            frames.add(i == 0 ? f : new FrameRecord(f.file(), f.tS(), f.sha256(), false,
                    new FrameRecord.Registration("failed", null, "image similarity too low", null)));
        }
        List<PartResult> noRates = new ArrayList<>();
        for (PartResult p : r.parts())
            noRates.add(new PartResult(p.ref(), p.rank(), null, null, null, null, null, null, null, null, null, null,
                    p.validFraction(), p.emissivity(), p.warnings()));
        AnalysisResult worse = new AnalysisResult(r.schema(), r.tool(), r.version(), r.createdUtc(), r.series(),
                r.board(), r.profile(), r.parameters(), r.injection(), r.verdict(), noRates, r.hotspots(), frames);
        String page = ReportHtml.toHtml(new Analysis(worse, a.board(), a.curves(), a.riseMap(), a.onsetMap(),
                a.lastFrame()), null);
        assertFalse(page.contains("before/after comparison"), "status line of a series");
        // and the mode the analysis records decides when present
        java.util.Map<String, Object> params = new java.util.LinkedHashMap<>(r.parameters());
        params.put("mode", "compare");
        AnalysisResult pair = new AnalysisResult(r.schema(), r.tool(), r.version(), r.createdUtc(), r.series(),
                r.board(), r.profile(), params, r.injection(), r.verdict(), r.parts(), r.hotspots(), r.frames());
        assertTrue(ReportHtml.isComparison(new Analysis(pair, a.board(), a.curves(), a.riseMap(), a.onsetMap(),
                a.lastFrame())));
    }

    @Test
    void clippedColourBarIsSaidInTheCaption() {
        // 1000 values 0..0.999 and one outlier at 50: a bar to 1.0 leaves the outlier beyond it
        float[] v = new float[1001];
        for (int i = 0; i < 1000; i++) v[i] = i / 1000f;
        v[1000] = 50f;
        String note = ReportHtml.clipNote(v, 0.0, 1.0, "K");
        assertEquals(" The colour bar is clipped to 0 to 1 K: under 0.1 % of the points lie beyond it and show its"
                + " end colours (0 below, 1 above).", note);
        assertEquals("", ReportHtml.clipNote(v, 0.0, 50.0, "K"), "nothing beyond the bar: nothing said");
    }
}
