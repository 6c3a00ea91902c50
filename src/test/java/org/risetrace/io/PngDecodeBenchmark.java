package org.risetrace.io;

import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.risetrace.bench.ImportBenchmark;
import org.junit.jupiter.api.io.TempDir;

import javax.imageio.ImageIO;
import java.awt.image.BufferedImage;
import java.awt.image.DataBufferUShort;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Locale;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;

/**
 * PngReader's decode of 640 x 480 16-bit grey frames with the direct decoder (PngGrey) against the JDK plug-in
 * path it replaces, on the same bytes already in memory, back to back per file so that load from other processes
 * falls on both alike. Two kinds of file: as ImageIO's writer makes them (filter type None on every row) and
 * Paeth-filtered on every row (the costliest filter to undo). Not a timed test: it prints, it does not assert times.
 * Run: {@code mvn -B -o test -Dbench.exclude=none -Dgroups=benchmark -Dtest=PngDecodeBenchmark}
 */
@Tag("benchmark")
class PngDecodeBenchmark {
    static final int W = 640, H = 480, FRAMES = 30, WARMUP = 5, PASSES = 9;

    @TempDir
    Path dir;

    /** A board at 25 degC in centikelvin with a gentle gradient, four warm parts and 0.05 K noise. */
    static int[] scene(Random rnd) {
        double[][] parts = {{120, 100, 18, 900}, {400, 260, 30, 400}, {520, 400, 10, 1500}, {250, 380, 45, 200}};
        int[] v = new int[W * H];
        for (int y = 0; y < H; y++)
            for (int x = 0; x < W; x++) {
                double c = 29815 + 0.8 * x - 0.5 * y;
                for (double[] p : parts) {
                    double dx = x - p[0], dy = y - p[1];
                    c += p[3] * Math.exp(-(dx * dx + dy * dy) / (2 * p[2] * p[2]));
                }
                v[y * W + x] = (int) Math.round(c + 5 * rnd.nextGaussian());
            }
        return v;
    }

    @Test
    void directGreyDecodeAgainstImageIoPath() throws IOException {
        Random rnd = new Random(20261202);
        PngReader direct = new PngReader(), imageIo = new PngReader(false);
        ReadContext ctx = ReadContext.defaults();
        System.out.printf(Locale.ROOT, "PngDecodeBenchmark: %d frames %dx%d 16-bit grey, %d warm-up + %d timed passes,"
                        + " Java %s, %d cores%n", FRAMES, W, H, WARMUP, PASSES, System.getProperty("java.version"),
                Runtime.getRuntime().availableProcessors());
        for (String kind : new String[]{"imageio-writer", "paeth-rows"}) {
            Path[] files = new Path[FRAMES];
            byte[][] bytes = new byte[FRAMES][];
            for (int i = 0; i < FRAMES; i++) {
                int[] v = scene(rnd);
                files[i] = dir.resolve(kind + "-" + i + ".png");
                if (kind.equals("imageio-writer")) {
                    BufferedImage img = new BufferedImage(W, H, BufferedImage.TYPE_USHORT_GRAY);
                    short[] d = ((DataBufferUShort) img.getRaster().getDataBuffer()).getData();
                    for (int k = 0; k < v.length; k++) d[k] = (short) v[k];
                    ImageIO.write(img, "png", files[i].toFile());
                } else {
                    Files.write(files[i], PngGreyTest.png(W, H, 16, 0,
                            PngGreyTest.zlib(PngGreyTest.filtered(W, H, 16, v, 4)), 1));
                }
                bytes[i] = Files.readAllBytes(files[i]);
                // the two paths agree before either is timed
                assertArrayEquals(imageIo.decode(files[i], bytes[i], ctx).u16(), direct.decode(files[i], bytes[i], ctx).u16());
            }
            double[] tImageIo = new double[PASSES], tDirect = new double[PASSES];
            long check = 0;
            for (int pass = -WARMUP; pass < PASSES; pass++) {
                double a = 0, b = 0;
                for (int i = 0; i < FRAMES; i++) {
                    long t0 = System.nanoTime();
                    check += imageIo.decode(files[i], bytes[i], ctx).u16()[W + 1];
                    long t1 = System.nanoTime();
                    check += direct.decode(files[i], bytes[i], ctx).u16()[W + 1];
                    long t2 = System.nanoTime();
                    a += (t1 - t0) / 1e6;
                    b += (t2 - t1) / 1e6;
                }
                if (pass >= 0) {
                    tImageIo[pass] = a / FRAMES;
                    tDirect[pass] = b / FRAMES;
                }
            }
            long size = 0;
            for (byte[] b : bytes) size += b.length;
            double mi = ImportBenchmark.median(tImageIo), md = ImportBenchmark.median(tDirect);
            double fi = Arrays.stream(tImageIo).min().orElseThrow(), fd = Arrays.stream(tDirect).min().orElseThrow();
            System.out.printf(Locale.ROOT, "  %-15s %4.0f KiB/frame  ImageIO path %6.2f ms/frame  direct %6.2f ms/frame"
                            + "  ratio %.1fx (median pass)  %.1fx (fastest pass)%s%n",
                    kind, size / 1024.0 / FRAMES, mi, md, mi / md, fi / fd, check == 42 ? " " : "");
        }
    }
}
