package org.risetrace.report;

import org.jfree.chart.ChartUtils;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.annotations.XYShapeAnnotation;
import org.jfree.chart.annotations.XYTextAnnotation;
import org.jfree.chart.axis.AxisLocation;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.NumberTickUnit;
import org.jfree.chart.block.BlockBorder;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.title.LegendTitle;
import org.jfree.chart.title.PaintScaleLegend;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.chart.ui.RectangleInsets;
import org.jfree.chart.ui.TextAnchor;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import org.risetrace.analysis.FrameRecord;
import org.risetrace.analysis.Hotspot;
import org.risetrace.analysis.RiseCurve;
import org.risetrace.board.Part;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.Shape;
import java.awt.geom.Ellipse2D;
import java.awt.geom.Path2D;
import java.awt.geom.Rectangle2D;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.util.Arrays;
import java.util.List;

/** The report's plots, drawn with JFreeChart and encoded as PNG. Runs headless. */
final class Plots {
    static {
        // before any AWT class loads: draw off screen, never open a display
        if (System.getProperty("java.awt.headless") == null) System.setProperty("java.awt.headless", "true");
    }

    /** Width in pixels of every plot image; the height follows the content. */
    static final int WIDTH_PX = 900;
    static final int CURVES_HEIGHT_PX = 460;
    static final int RMS_HEIGHT_PX = 220;
    /** At most this many blocks across a map: finer maps are averaged into bins (the PNG stays small). */
    static final int MAX_BLOCKS_ACROSS = 240;

    /** Line colours for the curves: the Okabe & Ito (2008) palette, distinguishable with colour-vision deficiency. */
    static final Color[] LINE_COLOURS = {new Color(0x0072B2), new Color(0xD55E00), new Color(0x009E73),
            new Color(0xCC79A7), new Color(0xE69F00), new Color(0x56B4E9), new Color(0x000000)};

    private static final Font AXIS_FONT = new Font(Font.SANS_SERIF, Font.PLAIN, 13);
    private static final Font TICK_FONT = new Font(Font.SANS_SERIF, Font.PLAIN, 12);
    private static final Font LABEL_FONT = new Font(Font.SANS_SERIF, Font.BOLD, 13);
    private static final Color GRID = new Color(0xdddddd);
    /** Where a map has no value: grey hatching, which no colour of a map can be mistaken for. */
    private static final java.awt.Paint NO_VALUE = hatch();

    private static java.awt.Paint hatch() {
        java.awt.image.BufferedImage tile = new java.awt.image.BufferedImage(8, 8, java.awt.image.BufferedImage.TYPE_INT_RGB);
        for (int y = 0; y < 8; y++)
            for (int x = 0; x < 8; x++) tile.setRGB(x, y, ((x + y) % 8 < 2) ? 0xa8a8a8 : 0xe4e4e4);
        return new java.awt.TexturePaint(tile, new Rectangle2D.Double(0, 0, 8, 8));
    }

    private Plots() { }

    /**
     * A scalar grid in board space to be shown as a map.
     *
     * @param width      grid columns
     * @param height     grid rows
     * @param pxPerMm    grid resolution; cell (i, j) is centred on ((i + 0.5) / pxPerMm, (j + 0.5) / pxPerMm) mm
     * @param values     row-major, NaN where there is no value
     * @param boardWMm   board width (x axis range)
     * @param boardHMm   board height (y axis range)
     */
    record Grid(int width, int height, double pxPerMm, float[] values, double boardWMm, double boardHMm) {
    }

    /** How to colour a map. */
    record Shading(ColourMaps map, double lower, double upper, boolean reversed, String scaleLabel) {
    }

    /** Height of a map image for a board of this aspect so that millimetres are square on screen (roughly). */
    static int mapHeightPx(double boardWMm, double boardHMm) {
        double plotW = WIDTH_PX - 190.0;  // axis, colour scale and margins
        double aspect = boardWMm > 0 && boardHMm > 0 ? boardHMm / boardWMm : 0.75;
        int h = (int) Math.round(plotW * aspect + 80);
        return Math.max(260, Math.min(1100, h));
    }

    static byte[] mapPng(Grid grid, Shading shading, List<Part> parts, List<Hotspot> hotspots) {
        return png(mapChart(grid, shading, parts, hotspots), WIDTH_PX, mapHeightPx(grid.boardWMm(), grid.boardHMm()));
    }

    /**
     * The map's values as an image, one pixel per bin: maps finer than {@link #MAX_BLOCKS_ACROSS} across are averaged
     * into square bins of {@code f} x {@code f} grid cells; each bin's mean is coloured through the colour map's
     * 256-entry table (the same colour {@link ColourScale} gives the scale bar); a bin without a value is transparent,
     * so the plot's hatching shows through.
     */
    static BufferedImage mapImage(Grid grid, Shading shading) {
        int f = binSize(grid);
        int bw = (grid.width() + f - 1) / f, bh = (grid.height() + f - 1) / f;
        ColourScale scale = new ColourScale(shading.map(), shading.lower(), shading.upper(), shading.reversed());
        double lower = scale.getLowerBound(), span = scale.getUpperBound() - lower;
        int[] lut = shading.map().table();
        int[] argb = new int[bw * bh];
        float[] values = grid.values();
        for (int bj = 0; bj < bh; bj++) {
            int j0 = bj * f, j1 = Math.min(grid.height(), j0 + f);
            for (int bi = 0; bi < bw; bi++) {
                int i0 = bi * f, i1 = Math.min(grid.width(), i0 + f);
                double sum = 0;
                int count = 0;
                for (int j = j0; j < j1; j++)
                    for (int i = i0; i < i1; i++) {
                        float v = values[j * grid.width() + i];
                        if (!Float.isNaN(v)) { sum += v; count++; }
                    }
                if (count == 0) continue;  // transparent
                double t = (sum / count - lower) / span;
                if (shading.reversed()) t = 1 - t;
                int k = (int) Math.round(Math.max(0, Math.min(1, t)) * (lut.length - 1));
                argb[bj * bw + bi] = 0xff000000 | lut[k];
            }
        }
        BufferedImage img = new BufferedImage(bw, bh, BufferedImage.TYPE_INT_ARGB);
        img.setRGB(0, 0, bw, bh, argb, 0, bw);
        return img;
    }

    /** Grid cells per bin side: 1 up to {@link #MAX_BLOCKS_ACROSS} cells across, else enough to stay under it. */
    static int binSize(Grid grid) {
        return Math.max(1, (int) Math.ceil(grid.width() / (double) MAX_BLOCKS_ACROSS));
    }

    /**
     * The map as a chart: the values drawn as one image (nearest neighbour, one image pixel per bin) under the
     * chart's axes and colour scale, part outlines and designators, hot spot rings. Drawing the image straight
     * replaced one chart block per bin (tens of thousands of filled shapes, about a second per report cold).
     */
    static JFreeChart mapChart(Grid grid, Shading shading, List<Part> parts, List<Hotspot> hotspots) {
        int f = binSize(grid);
        BufferedImage image = mapImage(grid, shading);

        NumberAxis xAxis = mmAxis("x (mm)");
        NumberAxis yAxis = mmAxis("y (mm)");
        yAxis.setInverted(true);  // board y runs down, as on the frames
        xAxis.setRange(0, grid.boardWMm());
        yAxis.setRange(0, grid.boardHMm());
        double step = niceStep(Math.max(grid.boardWMm(), grid.boardHMm()) / 16);
        xAxis.setTickUnit(new NumberTickUnit(step));
        yAxis.setTickUnit(new NumberTickUnit(step));

        ColourScale scale = new ColourScale(shading.map(), shading.lower(), shading.upper(), shading.reversed());
        XYPlot plot = new XYPlot(null, xAxis, yAxis, null);
        // bin (bi, bj) covers [bi f, (bi + 1) f) grid cells, cell i spanning [i, i + 1) / pxPerMm mm
        plot.addAnnotation(new MapImageAnnotation(image, image.getWidth() * f / grid.pxPerMm(),
                image.getHeight() * f / grid.pxPerMm()));
        plot.setBackgroundPaint(NO_VALUE);
        plot.setDomainGridlinesVisible(false);
        plot.setRangeGridlinesVisible(false);
        plot.setAxisOffset(RectangleInsets.ZERO_INSETS);
        plot.setOutlinePaint(Color.DARK_GRAY);

        for (Part p : parts) {
            Shape outline = partOutline(p);
            plot.addAnnotation(new XYShapeAnnotation(outline, new BasicStroke(3.2f), new Color(0, 0, 0, 170), null));
            plot.addAnnotation(new XYShapeAnnotation(outline, new BasicStroke(1.3f), Color.WHITE, null));
            XYTextAnnotation label = new XYTextAnnotation(p.ref(), p.xMm(), labelY(p));
            label.setFont(LABEL_FONT);
            label.setPaint(Color.WHITE);
            label.setBackgroundPaint(new Color(0, 0, 0, 150));
            label.setTextAnchor(TextAnchor.BOTTOM_CENTER);
            plot.addAnnotation(label);
        }
        if (hotspots != null) {
            double r = Math.max(grid.boardWMm(), grid.boardHMm()) / 70;
            for (int k = 0; k < hotspots.size(); k++) {
                Hotspot h = hotspots.get(k);
                if (!Double.isFinite(h.xMm()) || !Double.isFinite(h.yMm())) continue;
                Shape ring = new Ellipse2D.Double(h.xMm() - r, h.yMm() - r, 2 * r, 2 * r);
                Color c = h.ref() == null ? new Color(0x00e5ff) : Color.WHITE;
                plot.addAnnotation(new XYShapeAnnotation(ring, new BasicStroke(3.5f), Color.BLACK, null));
                plot.addAnnotation(new XYShapeAnnotation(ring, new BasicStroke(1.8f), c, null));
                XYTextAnnotation t = new XYTextAnnotation("#" + (k + 1), h.xMm() + r * 1.2, h.yMm());
                t.setFont(LABEL_FONT);
                t.setPaint(c);
                t.setBackgroundPaint(new Color(0, 0, 0, 150));
                t.setTextAnchor(TextAnchor.CENTER_LEFT);
                plot.addAnnotation(t);
            }
        }

        JFreeChart chart = new JFreeChart(null, JFreeChart.DEFAULT_TITLE_FONT, plot, false);
        chart.setBackgroundPaint(Color.WHITE);
        chart.setPadding(new RectangleInsets(6, 6, 6, 6));
        NumberAxis scaleAxis = new NumberAxis(shading.scaleLabel());
        scaleAxis.setRange(scale.getLowerBound(), scale.getUpperBound());
        scaleAxis.setTickUnit(new NumberTickUnit(niceStep((scale.getUpperBound() - scale.getLowerBound()) / 10)));
        scaleAxis.setLabelFont(AXIS_FONT);
        scaleAxis.setTickLabelFont(TICK_FONT);
        PaintScaleLegend legend = new PaintScaleLegend(scale, scaleAxis);
        legend.setPosition(RectangleEdge.RIGHT);
        legend.setAxisLocation(AxisLocation.BOTTOM_OR_RIGHT);
        legend.setStripWidth(18);
        legend.setSubdivisionCount(256);
        legend.setStripOutlineVisible(true);
        legend.setMargin(new RectangleInsets(4, 12, 4, 4));
        legend.setBackgroundPaint(Color.WHITE);
        chart.addSubtitle(legend);
        return chart;
    }

    /**
     * Draws an image over the board rectangle [0, wMm] x [0, hMm] in data coordinates (nearest neighbour: each image
     * pixel stays a sharp square, as the map's bins are).
     */
    static final class MapImageAnnotation extends org.jfree.chart.annotations.AbstractXYAnnotation {
        private static final long serialVersionUID = 1L;
        private final transient BufferedImage image;
        private final double wMm, hMm;

        MapImageAnnotation(BufferedImage image, double wMm, double hMm) {
            this.image = image;
            this.wMm = wMm;
            this.hMm = hMm;
        }

        @Override
        public void draw(java.awt.Graphics2D g2, XYPlot plot, Rectangle2D dataArea,
                         org.jfree.chart.axis.ValueAxis domainAxis, org.jfree.chart.axis.ValueAxis rangeAxis,
                         int rendererIndex, org.jfree.chart.plot.PlotRenderingInfo info) {
            double xa = domainAxis.valueToJava2D(0, dataArea, plot.getDomainAxisEdge());
            double xb = domainAxis.valueToJava2D(wMm, dataArea, plot.getDomainAxisEdge());
            double ya = rangeAxis.valueToJava2D(0, dataArea, plot.getRangeAxisEdge());
            double yb = rangeAxis.valueToJava2D(hMm, dataArea, plot.getRangeAxisEdge());
            java.awt.geom.AffineTransform at = new java.awt.geom.AffineTransform(
                    (xb - xa) / image.getWidth(), 0, 0, (yb - ya) / image.getHeight(), xa, ya);
            Object hint = g2.getRenderingHint(java.awt.RenderingHints.KEY_INTERPOLATION);
            g2.setRenderingHint(java.awt.RenderingHints.KEY_INTERPOLATION,
                    java.awt.RenderingHints.VALUE_INTERPOLATION_NEAREST_NEIGHBOR);
            g2.drawImage(image, at, null);
            if (hint != null) g2.setRenderingHint(java.awt.RenderingHints.KEY_INTERPOLATION, hint);
        }

        @Override public boolean equals(Object o) { return o == this; }

        @Override public int hashCode() { return System.identityHashCode(this); }
    }

    /** Labels sit just above the part, so hot spot rings at its centre never hide them. */
    private static double labelY(Part p) {
        return partOutline(p).getBounds2D().getMinY() - 0.3;
    }

    /** The smallest of 1, 2, 5 times a power of ten that is at least {@code raw}. */
    static double niceStep(double raw) {
        if (!(raw > 0) || !Double.isFinite(raw)) return 1;
        double p = Math.pow(10, Math.floor(Math.log10(raw)));
        for (double m : new double[]{1, 2, 5, 10}) if (m * p >= raw * (1 - 1e-9)) return m * p;
        return 10 * p;
    }

    /** The part's footprint as drawn: the rectangle rotated counter-clockwise as seen with y down (see Part). */
    static Shape partOutline(Part p) {
        double a = Math.toRadians(p.rotationOrZero());
        double c = Math.cos(a), s = Math.sin(a);
        double[][] uv = {{-p.wMm() / 2, -p.hMm() / 2}, {p.wMm() / 2, -p.hMm() / 2},
                {p.wMm() / 2, p.hMm() / 2}, {-p.wMm() / 2, p.hMm() / 2}};
        Path2D.Double path = new Path2D.Double();
        for (int k = 0; k < 4; k++) {
            // inverse of Part.contains: u = dx cos a - dy sin a, v = dx sin a + dy cos a
            double dx = uv[k][0] * c + uv[k][1] * s, dy = -uv[k][0] * s + uv[k][1] * c;
            if (k == 0) path.moveTo(p.xMm() + dx, p.yMm() + dy); else path.lineTo(p.xMm() + dx, p.yMm() + dy);
        }
        path.closePath();
        return path;
    }

    /** Rise-versus-time curves with their fitted rise models dashed, and the injection start as a vertical line. */
    static byte[] curvesPng(List<RiseCurve> curves, Double injectionStartS) {
        return png(curvesChart(curves, injectionStartS), WIDTH_PX, CURVES_HEIGHT_PX);
    }

    /** The chart {@link #curvesPng} draws; its data set holds per curve the measured series, then its fit line. */
    static JFreeChart curvesChart(List<RiseCurve> curves, Double injectionStartS) {
        XYSeriesCollection data = new XYSeriesCollection();
        // measured values as dots, the fit as a dashed line over them: both stay visible
        XYLineAndShapeRenderer renderer = new XYLineAndShapeRenderer(true, true);
        // one path per series, so the dash pattern runs along the whole fit line (segment by segment, each of the
        // short segments between measured times restarted the pattern and the line looked solid)
        renderer.setDrawSeriesLineAsPath(true);
        int series = 0;
        for (int k = 0; k < curves.size(); k++) {
            RiseCurve c = curves.get(k);
            Color colour = LINE_COLOURS[k % LINE_COLOURS.length];
            XYSeries measured = new XYSeries(c.ref() == null ? "part " + (k + 1) : c.ref(), false, true);
            int n = c.tS() == null || c.riseK() == null ? 0 : Math.min(c.tS().length, c.riseK().length);
            for (int i = 0; i < n; i++)
                if (Double.isFinite(c.tS()[i]) && Double.isFinite(c.riseK()[i])) measured.add(c.tS()[i], c.riseK()[i]);
            data.addSeries(measured);
            renderer.setSeriesPaint(series, colour);
            double[][] line = fitLine(c);
            boolean fitted = line[0].length > 0;
            renderer.setSeriesStroke(series, new BasicStroke(1.0f));
            renderer.setSeriesLinesVisible(series, !fitted);
            renderer.setSeriesShape(series, new Ellipse2D.Double(-3, -3, 6, 6));
            renderer.setSeriesShapesVisible(series, true);
            series++;
            if (fitted && n > 0) {
                XYSeries fit = new XYSeries(measured.getKey() + " fitted model", false, true);
                for (int i = 0; i < line[0].length; i++) fit.add(line[0][i], line[1][i]);
                data.addSeries(fit);
                renderer.setSeriesPaint(series, colour);
                renderer.setSeriesStroke(series, new BasicStroke(2.2f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_ROUND,
                        1f, new float[]{7f, 5f}, 0f));
                renderer.setSeriesShapesVisible(series, false);
                renderer.setSeriesLinesVisible(series, true);
                renderer.setSeriesVisibleInLegend(series, false);
                series++;
            }
        }
        NumberAxis xAxis = plainAxis("time in the series (s)");
        NumberAxis yAxis = plainAxis("rise above ambient (K)");
        yAxis.setAutoRangeIncludesZero(true);
        XYPlot plot = new XYPlot(data, xAxis, yAxis, renderer);
        stylePlain(plot);
        if (injectionStartS != null && Double.isFinite(injectionStartS)) {
            ValueMarker m = new ValueMarker(injectionStartS, Color.GRAY, new BasicStroke(1.2f, BasicStroke.CAP_BUTT,
                    BasicStroke.JOIN_ROUND, 1f, new float[]{3f, 3f}, 0f));
            m.setLabel("injection on");
            m.setLabelFont(TICK_FONT);
            double tMax = curves.stream().filter(c -> c.tS() != null).flatMapToDouble(c -> Arrays.stream(c.tS()))
                    .filter(Double::isFinite).max().orElse(injectionStartS);
            double tMin = curves.stream().filter(c -> c.tS() != null).flatMapToDouble(c -> Arrays.stream(c.tS()))
                    .filter(Double::isFinite).min().orElse(injectionStartS);
            boolean labelLeft = injectionStartS > (tMin + tMax) / 2;  // keep the label inside the plot
            m.setLabelAnchor(labelLeft ? org.jfree.chart.ui.RectangleAnchor.TOP_LEFT
                    : org.jfree.chart.ui.RectangleAnchor.TOP_RIGHT);
            m.setLabelTextAnchor(labelLeft ? TextAnchor.TOP_RIGHT : TextAnchor.TOP_LEFT);
            m.setLabelBackgroundColor(new Color(255, 255, 255, 0));
            plot.addDomainMarker(m);
        }
        JFreeChart chart = new JFreeChart(null, JFreeChart.DEFAULT_TITLE_FONT, plot, true);
        styleLegend(chart);
        return chart;
    }

    /**
     * The dashed line of a curve's fitted model as {times, values}: over the measured times, at each measured time,
     * at t0 (the kink where the model starts) and at 240 even steps between, so the line passes through the model's
     * value at every point drawn beside it. Empty without a fit or without an onset (a part that never rose has no
     * curve to fit).
     */
    static double[][] fitLine(RiseCurve c) {
        if (c.fit() == null || c.onsetS() == null || c.tS() == null) return new double[][]{{}, {}};
        double t0 = Double.POSITIVE_INFINITY, t1 = Double.NEGATIVE_INFINITY;
        for (double t : c.tS())
            if (Double.isFinite(t)) {
                t0 = Math.min(t0, t);
                t1 = Math.max(t1, t);
            }
        if (!(t1 > t0)) return new double[][]{{}, {}};
        int steps = 240;
        double[] ts = new double[steps + 2 + c.tS().length];
        int k = 0;
        for (int i = 0; i <= steps; i++) ts[k++] = t0 + (t1 - t0) * i / steps;
        double start = c.fit().t0S();
        ts[k++] = start >= t0 && start <= t1 ? start : t0;
        for (double t : c.tS()) ts[k++] = Double.isFinite(t) ? t : t0;
        Arrays.sort(ts, 0, k);
        double[] tt = new double[k], vv = new double[k];
        int m = 0;
        for (int i = 0; i < k; i++) {
            if (m > 0 && ts[i] == tt[m - 1]) continue;
            double v = c.fitAt(ts[i]);
            if (!Double.isFinite(v)) continue;
            tt[m] = ts[i];
            vv[m++] = v;
        }
        return new double[][]{Arrays.copyOf(tt, m), Arrays.copyOf(vv, m)};
    }

    /** The value plotted per frame: the estimated corner error, else the check patches' residual RMS; NaN if none. */
    static double registrationValue(FrameRecord f) {
        if (f.registration() == null) return Double.NaN;
        Double s = f.registration().cornerSigmaPx();
        if (s != null && Double.isFinite(s)) return s;
        Double r = f.registration().rmsPx();
        return r != null && Double.isFinite(r) ? r : Double.NaN;
    }

    /**
     * The estimated corner error per frame over time (the residual RMS where a frame has no estimate), one series per
     * status so weak frames stand out.
     */
    static byte[] registrationPng(List<FrameRecord> frames) {
        XYSeries ok = new XYSeries("ok / marked", true, true);
        XYSeries weak = new XYSeries("weak", true, true);
        XYSeries failed = new XYSeries("failed (left out; at 0 when not measured)", true, true);
        XYSeriesCollection data = new XYSeriesCollection();
        for (FrameRecord f : frames) {
            if (f.registration() != null && "failed".equals(f.registration().status()) && Double.isFinite(f.tS())) {
                double v = registrationValue(f);
                failed.add(f.tS(), Double.isFinite(v) ? v : 0.0);
                continue;
            }
            double v = registrationValue(f);
            if (!Double.isFinite(v) || !Double.isFinite(f.tS())) continue;
            if ("weak".equals(f.registration().status())) weak.add(f.tS(), v); else ok.add(f.tS(), v);
        }
        data.addSeries(ok);
        data.addSeries(weak);
        if (!failed.isEmpty()) data.addSeries(failed);
        XYLineAndShapeRenderer renderer = new XYLineAndShapeRenderer(false, true);
        renderer.setSeriesPaint(0, LINE_COLOURS[0]);
        renderer.setSeriesShape(0, new Ellipse2D.Double(-3, -3, 6, 6));
        renderer.setSeriesPaint(1, LINE_COLOURS[1]);
        renderer.setSeriesShape(1, new Rectangle2D.Double(-4, -4, 8, 8));
        renderer.setSeriesPaint(2, Color.BLACK);
        renderer.setSeriesShape(2, cross(5));
        NumberAxis xAxis = plainAxis("time in the series (s)");
        NumberAxis yAxis = plainAxis("corner error (px)"); // short: the chart is low, a longer label was cut off
        yAxis.setAutoRangeIncludesZero(true);
        yAxis.setUpperMargin(0.15);
        XYPlot plot = new XYPlot(data, xAxis, yAxis, renderer);
        stylePlain(plot);
        JFreeChart chart = new JFreeChart(null, JFreeChart.DEFAULT_TITLE_FONT, plot, true);
        styleLegend(chart);
        return png(chart, WIDTH_PX, RMS_HEIGHT_PX);
    }

    private static Shape cross(double r) {
        Path2D.Double p = new Path2D.Double();
        p.moveTo(-r, -r); p.lineTo(r, r); p.moveTo(-r, r); p.lineTo(r, -r);
        return new BasicStroke(2f).createStrokedShape(p);
    }

    private static NumberAxis mmAxis(String label) {
        NumberAxis a = plainAxis(label);
        a.setAutoRangeIncludesZero(false);
        return a;
    }

    private static NumberAxis plainAxis(String label) {
        NumberAxis a = new NumberAxis(label);
        a.setLabelFont(AXIS_FONT);
        a.setTickLabelFont(TICK_FONT);
        return a;
    }

    private static void stylePlain(XYPlot plot) {
        plot.setBackgroundPaint(Color.WHITE);
        plot.setDomainGridlinePaint(GRID);
        plot.setRangeGridlinePaint(GRID);
        plot.setOutlinePaint(Color.GRAY);
    }

    private static void styleLegend(JFreeChart chart) {
        chart.setBackgroundPaint(Color.WHITE);
        chart.setPadding(new RectangleInsets(6, 6, 6, 10));
        LegendTitle legend = chart.getLegend();
        if (legend != null) {
            legend.setFrame(BlockBorder.NONE);
            legend.setItemFont(TICK_FONT);
            legend.setPosition(RectangleEdge.BOTTOM);
        }
    }

    private static byte[] png(JFreeChart chart, int w, int h) {
        try {
            return ChartUtils.encodeAsPNG(chart.createBufferedImage(w, h));
        } catch (IOException e) {
            throw new UncheckedIOException("plot could not be encoded", e);
        }
    }
}
