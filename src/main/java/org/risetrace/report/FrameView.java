package org.risetrace.report;

import org.risetrace.frame.Frame;

import javax.imageio.ImageIO;
import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.FontMetrics;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;

/**
 * A frame drawn so that its pixel coordinates can be read off by eye: each frame pixel a block of {@code scale} x
 * {@code scale} screen pixels in the {@link ColourMaps#EMBER} map over the frame's full temperature range (nothing
 * clipped), a grid line through the centre of every pixel whose coordinate is a multiple of {@code gridPx}
 * (pixel centres at whole numbers, as board.json's {@code corners_px} count them), the coordinates in the margins,
 * and a colour scale in degrees Celsius on the right. This is how a newcomer reads the four board corners for
 * board.json before there is a marking tool.
 *
 * <p>Geometry (documented in the README, tested by FrameViewTest): the frame pixel (x, y) covers the image columns
 * {@code LEFT + x * scale} to {@code LEFT + (x + 1) * scale - 1} and the rows {@code TOP + y * scale} onwards; the
 * grid line for coordinate u runs through column {@code LEFT + u * scale + scale / 2} (scale is odd, so this is the
 * block's middle column), and likewise for rows.
 */
public final class FrameView {
    /** Margins around the frame, image pixels: left and top carry the coordinates, right the colour scale. */
    public static final int LEFT = 56, TOP = 36, RIGHT = 120, BOTTOM = 40;
    /** Grid lines: a colour the ember map never takes (it has no green-blue hues). */
    public static final int GRID_RGB = 0x00e0ff;
    /** Pixels without a temperature (NaN). */
    public static final int BLANK_RGB = 0xd8d8d8;
    private static final int BAR_WIDTH = 18, BAR_GAP = 14;

    private FrameView() {
    }

    /**
     * The magnification for a frame: odd (so a grid line has a middle column), about 960 image pixels across, 1 to 9.
     */
    public static int defaultScale(int frameWidth) {
        int s = Math.max(1, Math.min(9, 960 / Math.max(1, frameWidth)));
        return s % 2 == 1 ? s : s - 1;
    }

    /** Image column of the grid line (or pixel centre) for frame x coordinate u; rows likewise with TOP. */
    public static int column(int u, int scale) {
        return LEFT + u * scale + scale / 2;
    }

    public static int row(int v, int scale) {
        return TOP + v * scale + scale / 2;
    }

    /**
     * Draws the frame. {@code scale} must be odd and 1 to 15; {@code gridPx} at least 2.
     *
     * @param title the line under the frame (file name and what the view shows)
     */
    public static BufferedImage render(Frame frame, int scale, int gridPx, String title) {
        if (scale < 1 || scale > 15 || scale % 2 == 0) throw new IllegalArgumentException("scale must be odd, 1 to 15");
        if (gridPx < 2) throw new IllegalArgumentException("grid spacing must be at least 2 px");
        int w = frame.width(), h = frame.height();
        float[] c = frame.celsius();
        double lo = Double.POSITIVE_INFINITY, hi = Double.NEGATIVE_INFINITY;
        for (float v : c) if (Float.isFinite(v)) { lo = Math.min(lo, v); hi = Math.max(hi, v); }
        if (!(hi >= lo)) { lo = 0; hi = 1; }
        if (!(hi > lo)) hi = lo + 0.01;
        int iw = LEFT + w * scale + RIGHT, ih = TOP + h * scale + BOTTOM;
        BufferedImage img = new BufferedImage(iw, ih, BufferedImage.TYPE_INT_RGB);
        int[] px = new int[iw * ih];
        java.util.Arrays.fill(px, 0xffffff);
        ColourMaps map = ColourMaps.EMBER;
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                float v = c[y * w + x];
                int rgb = Float.isFinite(v) ? map.rgb((v - lo) / (hi - lo)) : BLANK_RGB;
                int x0 = LEFT + x * scale, y0 = TOP + y * scale;
                for (int j = 0; j < scale; j++) java.util.Arrays.fill(px, (y0 + j) * iw + x0, (y0 + j) * iw + x0 + scale, rgb);
            }
        }
        // grid lines through the middle of every gridPx-th pixel, over the frame only
        for (int u = 0; u < w; u += gridPx) {
            int col = column(u, scale);
            for (int yy = TOP; yy < TOP + h * scale; yy++) px[yy * iw + col] = GRID_RGB;
        }
        for (int v = 0; v < h; v += gridPx) {
            int r = row(v, scale);
            java.util.Arrays.fill(px, r * iw + LEFT, r * iw + LEFT + w * scale, GRID_RGB);
        }
        img.setRGB(0, 0, iw, ih, px, 0, iw);

        Graphics2D g = img.createGraphics();
        try {
            g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
            g.setFont(new Font(Font.SANS_SERIF, Font.PLAIN, 11));
            FontMetrics fm = g.getFontMetrics();
            g.setColor(Color.BLACK);
            // coordinate labels: every grid line, thinned so labels do not overlap
            int labelEvery = gridPx * Math.max(1, (int) Math.ceil((fm.stringWidth(String.valueOf(w)) + 6.0) / (gridPx * scale)));
            for (int u = 0; u < w; u += labelEvery) {
                String s = String.valueOf(u);
                int col = column(u, scale);
                g.drawString(s, col - fm.stringWidth(s) / 2, TOP - 8);
                g.drawLine(col, TOP - 5, col, TOP - 1);
            }
            int rowEvery = gridPx * Math.max(1, (int) Math.ceil((fm.getHeight() + 2.0) / (gridPx * scale)));
            for (int v = 0; v < h; v += rowEvery) {
                String s = String.valueOf(v);
                int r = row(v, scale);
                g.drawString(s, LEFT - 8 - fm.stringWidth(s), r + fm.getAscent() / 2 - 1);
                g.drawLine(LEFT - 5, r, LEFT - 1, r);
            }
            g.drawString("x (px)", LEFT, 12);
            // colour scale: the frame's full range, hottest at the top
            int bx = LEFT + w * scale + BAR_GAP, by = TOP, bh = h * scale;
            for (int j = 0; j < bh; j++) {
                g.setColor(map.colour(1.0 - j / (double) Math.max(1, bh - 1)));
                g.drawLine(bx, by + j, bx + BAR_WIDTH - 1, by + j);
            }
            g.setColor(Color.BLACK);
            g.setStroke(new BasicStroke(1f));
            g.drawRect(bx - 1, by - 1, BAR_WIDTH + 1, bh + 1);
            int ticks = 5;
            for (int k = 0; k <= ticks; k++) {
                double t = k / (double) ticks;
                int yy = by + (int) Math.round((1 - t) * (bh - 1));
                g.drawLine(bx + BAR_WIDTH, yy, bx + BAR_WIDTH + 3, yy);
                g.drawString(String.format(Locale.ROOT, "%.2f", lo + t * (hi - lo)), bx + BAR_WIDTH + 6,
                        yy + fm.getAscent() / 2 - 1);
            }
            g.drawString("\u00b0C", bx, TOP - 8);
            g.drawString(title, LEFT, TOP + h * scale + 26);
        } finally {
            g.dispose();
        }
        return img;
    }

    /** The frame's temperature range as the colour scale shows it: {min, max} of the finite values. */
    public static double[] range(Frame frame) {
        double lo = Double.POSITIVE_INFINITY, hi = Double.NEGATIVE_INFINITY;
        for (float v : frame.celsius()) if (Float.isFinite(v)) { lo = Math.min(lo, v); hi = Math.max(hi, v); }
        return new double[]{lo, hi};
    }

    public static void writePng(BufferedImage img, Path file) {
        try {
            Path parent = file.toAbsolutePath().getParent();
            if (parent != null) Files.createDirectories(parent);
            if (!ImageIO.write(img, "png", file.toFile())) throw new IOException("no PNG writer");
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write " + file, e);
        }
    }
}
