package org.risetrace.bench;

import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.frame.Frame;
import org.risetrace.io.ReadContext;
import org.risetrace.io.Series;

import javax.imageio.IIOImage;
import javax.imageio.ImageIO;
import javax.imageio.ImageWriteParam;
import javax.imageio.ImageWriter;
import javax.imageio.stream.ImageOutputStream;
import java.awt.image.BufferedImage;
import java.awt.image.DataBufferUShort;
import java.io.File;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Iterator;
import java.util.List;
import java.util.Locale;
import java.util.Random;

/**
 * Import cost versus the bare JDK ImageIO decode of the same files: 50 frames of 640 x 512 16-bit counts with a
 * thermal-like scene (board at 25 degC, warm parts, 0.05 K noise) as PNG, uncompressed TIFF and Deflate TIFF.
 * "ours" is a full Series pass: read the file, SHA-256, decode, map to degrees Celsius, range check.
 * Run: {@code mvn -B test -Dbench.exclude=none -Dgroups=benchmark -Dtest=ImportBenchmark}
 */
@Tag("benchmark")
public class ImportBenchmark {
    static final int W = 640, H = 512, FRAMES = 50, WARMUP = 3, PASSES = 7;

    @TempDir
    Path dir;

    public static BufferedImage scene(Random rnd, int k) {
        BufferedImage img = new BufferedImage(W, H, BufferedImage.TYPE_USHORT_GRAY);
        short[] d = ((DataBufferUShort) img.getRaster().getDataBuffer()).getData();
        double[][] parts = {{120, 100, 18, 900}, {400, 260, 30, 350 + 20 * k}, {520, 420, 10, 1500}, {250, 380, 45, 200}};
        for (int y = 0; y < H; y++)
            for (int x = 0; x < W; x++) {
                double c = 29815 + 0.8 * x - 0.5 * y; // 25 degC in centikelvin with a gentle gradient
                for (double[] p : parts) {
                    double dx = x - p[0], dy = y - p[1];
                    c += p[3] * Math.exp(-(dx * dx + dy * dy) / (2 * p[2] * p[2]));
                }
                c += 5 * rnd.nextGaussian(); // 0.05 K noise, a typical uncooled NETD
                d[y * W + x] = (short) Math.round(c);
            }
        return img;
    }

    public static void write(BufferedImage img, String format, String compression, File f) throws IOException {
        ImageWriter w = ImageIO.getImageWritersByFormatName(format).next();
        try (ImageOutputStream out = ImageIO.createImageOutputStream(f)) {
            w.setOutput(out);
            ImageWriteParam p = w.getDefaultWriteParam();
            if (compression != null) {
                p.setCompressionMode(ImageWriteParam.MODE_EXPLICIT);
                p.setCompressionType(compression);
            }
            w.write(null, new IIOImage(img, null, null), p);
        } finally {
            w.dispose();
        }
    }

    /**
     * One pass over the series, the two decodes of each file back to back (bare ImageIO.read, then the series
     * iterator's next frame) so that load from other processes falls on both alike. Adds seconds to t[0], t[1].
     */
    static void pass(List<Path> files, Series series, double[] t) throws IOException {
        Iterator<Frame> it = series.iterator();
        long sum = 0;
        double check = 0;
        for (Path f : files) {
            long t0 = System.nanoTime();
            BufferedImage img = ImageIO.read(f.toFile());
            sum += ((DataBufferUShort) img.getRaster().getDataBuffer()).getData()[W + 1];
            long t1 = System.nanoTime();
            check += it.next().celsius()[W + 1];
            long t2 = System.nanoTime();
            t[0] += (t1 - t0) / 1e9;
            t[1] += (t2 - t1) / 1e9;
        }
        if (sum == 42 && check == 42) System.out.println(); // keeps both results live
    }

    /** The median of the timed passes (also used by io.PngDecodeBenchmark). */
    public static double median(double[] v) {
        double[] c = v.clone();
        Arrays.sort(c);
        return c[c.length / 2];
    }

    @Test
    void importCostAgainstBareImageIoDecode() throws IOException {
        Random rnd = new Random(20261201);
        String[][] kinds = {{"png", null, "png"}, {"tiff", null, "tif"}, {"tiff", "Deflate", "tif"}};
        System.out.printf(Locale.ROOT, "ImportBenchmark: %d frames %dx%d 16-bit, %d warm-up + %d timed passes, Java %s, %d cores%n",
                FRAMES, W, H, WARMUP, PASSES, System.getProperty("java.version"), Runtime.getRuntime().availableProcessors());
        for (String[] kind : kinds) {
            Path sub = Files.createDirectory(dir.resolve(kind[0] + (kind[1] == null ? "" : "-" + kind[1])));
            for (int i = 0; i < FRAMES; i++)
                write(scene(rnd, i), kind[0], kind[1], sub.resolve(String.format("f%03d.%s", i, kind[2])).toFile());
            Files.writeString(sub.resolve("series.json"), "{\"profile\": \"u16-centikelvin\", \"frame_interval_s\": 0.1}");
            Series series = Series.open(sub, null, ReadContext.DEFAULT_MAX_PIXELS);
            List<Path> files = series.files();
            long bytes = 0;
            for (Path f : files) bytes += Files.size(f);
            for (int i = 0; i < WARMUP; i++) pass(files, series, new double[2]);
            double[] tBare = new double[PASSES], tOurs = new double[PASSES];
            for (int i = 0; i < PASSES; i++) {
                double[] t = new double[2];
                pass(files, series, t);
                tBare[i] = t[0];
                tOurs[i] = t[1];
            }
            double b = median(tBare), o = median(tOurs);
            double bMin = Arrays.stream(tBare).min().orElseThrow(), oMin = Arrays.stream(tOurs).min().orElseThrow();
            System.out.printf(Locale.ROOT, "  %-13s %4.0f KiB/frame  bare ImageIO %6.1f frames/s  risetrace import %6.1f frames/s"
                            + "  ratio %.2f (median pass)  %.2f (fastest pass)%n",
                    sub.getFileName(), bytes / 1024.0 / FRAMES, FRAMES / b, FRAMES / o, o / b, oMin / bMin);
        }
    }
}
