package org.risetrace.sim;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.frame.Frame;
import org.risetrace.io.Series;
import org.risetrace.io.write.FrameEncoding;

import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The simulator's exports read back through the import stage (org.risetrace.io.Series with series.json): the same
 * scenario and seed written as float TIFF (exact) and as 16-bit centikelvin PNG or auto-ranged 8-bit PNG decode to the
 * same temperatures within half a quantisation step.
 */
class ImportRoundTripTest {
    @TempDir
    Path dir;

    private static Scenario scenario() {
        return Scenarios.small(1.5).withFrames(6, 2.0, 1.0).withSize(96, 64)
                .withMotion(Scenario.Motion.handheld(5, 0.1, 0.15));
    }

    private float[][] decode(Path folder, int n) {
        Series series = Series.open(folder);
        assertEquals(n, series.size());
        float[][] out = new float[n][];
        for (int i = 0; i < n; i++) {
            Frame f = series.read(i);
            assertEquals(2.0 * i, f.tSeconds(), 1e-9, "frame time from series.json");
            out[i] = f.celsius();
        }
        return out;
    }

    @Test
    void centikelvinPngAndAutoSpanPngDecodeToTheFloatSeriesWithinHalfAStep() {
        Path f32 = dir.resolve("f32"), u16 = dir.resolve("u16"), u8 = dir.resolve("u8");
        Simulator.run(scenario().withEncoding(FrameEncoding.F32_TIFF), f32);
        Simulator.run(scenario().withEncoding(FrameEncoding.U16_CENTIKELVIN_PNG), u16);
        Scenario.CameraSpec c = scenario().camera();
        Scenario span = scenario().withCamera(new Scenario.CameraSpec(c.width(), c.height(), c.focalPx(), c.distanceMm(),
                c.tiltDeg(), c.tiltAxisDeg(), c.rotationDeg(), c.offsetPx(), c.motion(), c.blurSigmaPx(), c.netdK(),
                c.fixedPatternK(), c.bandUm(), "u8-span-png", null, true, c.supersample(), c.backgroundEmissivity(),
                c.reflectedC(), c.exifStart()));
        SimulationOutput spanOut = Simulator.run(span, u8);
        float[][] exact = decode(f32, 6), centi = decode(u16, 6), grey = decode(u8, 6);
        for (int k = 0; k < 6; k++) {
            double[] s = spanOut.sidecar().frames().get(String.format("f%04d.png", k + 1)).spanC();
            double step = (s[1] - s[0]) / 255; // 8-bit span: 256 levels from low to high (u8-span profile)
            assertTrue(step < 0.2, "span " + s[0] + ".." + s[1]);
            for (int i = 0; i < exact[k].length; i++) {
                assertEquals(exact[k][i], centi[k][i], 0.005 + 1e-4, "centikelvin, frame " + k); // 0.01 K per count
                assertEquals(exact[k][i], grey[k][i], step / 2 + 1e-4, "8-bit span, frame " + k);
            }
        }
        // the float series itself against the JDK's TIFF decoder (TIFF 6.0 SampleFormat 3, f32-celsius: the samples
        // are the temperatures), so "exact" is not only our own reader's word
        try {
            java.io.File first = f32.resolve("f0001.tif").toFile();
            java.awt.image.Raster r = javax.imageio.ImageIO.read(first).getRaster();
            float[] ref = new float[exact[0].length];
            for (int i = 0; i < ref.length; i++) ref[i] = r.getSampleFloat(i % r.getWidth(), i / r.getWidth(), 0);
            assertArrayEquals(ref, exact[0]);
        } catch (java.io.IOException e) {
            throw new java.io.UncheckedIOException(e);
        }
    }
}
