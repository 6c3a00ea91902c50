package org.risetrace.sim;

import org.risetrace.registration.Homography;
import nu.pattern.OpenCV;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.opencv.calib3d.Calib3d;
import org.opencv.core.Core;
import org.opencv.core.CvType;
import org.opencv.core.Mat;
import org.opencv.core.MatOfDouble;
import org.opencv.core.MatOfPoint2f;
import org.opencv.core.MatOfPoint3f;
import org.opencv.core.Point;
import org.opencv.core.Point3;
import org.risetrace.io.write.FrameEncoding;

import javax.imageio.ImageIO;
import java.awt.image.Raster;
import java.io.IOException;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The camera model: geometry against OpenCV's projection, rendering against coverage, noise against NETD. */
class CameraModelTest {
    @TempDir
    Path dir;

    @BeforeAll
    static void loadOpenCv() {
        OpenCV.loadLocally();
    }

    /** Cross-check with OpenCV's pinhole projection (Calib3d.projectPoints, general-purpose reference library). */
    @Test
    void tiltedRotatedPoseProjectsCornersWhereOpenCvPutsThem() {
        double tiltDeg = 12, rotDeg = 7, f = 420, d = 300, w = 80, h = 50;
        Scenario.CameraSpec cam = Scenarios.small().camera();
        cam = new Scenario.CameraSpec(320, 256, f, d, tiltDeg, 0.0, rotDeg, new double[]{4, -3}, null, null, null,
                null, null, null, null, null, null, null, null, null);
        Homography hom = CameraModel.basePose(cam, w, h);
        // rotation = Rx(tilt) * Rz(rot), composed from OpenCV's own Rodrigues conversions
        Mat rx = new Mat(), rz = new Mat(), r = new Mat(), rvec = new Mat();
        Calib3d.Rodrigues(vec(Math.toRadians(tiltDeg), 0, 0), rx);
        Calib3d.Rodrigues(vec(0, 0, Math.toRadians(rotDeg)), rz);
        Core.gemm(rx, rz, 1, new Mat(), 0, r);
        Calib3d.Rodrigues(r, rvec);
        Mat k = Mat.zeros(3, 3, CvType.CV_64F);
        k.put(0, 0, f, 0, (320 - 1) / 2.0 + 4, 0, f, (256 - 1) / 2.0 - 3, 0, 0, 1);
        MatOfPoint3f board = new MatOfPoint3f(new Point3(-w / 2, -h / 2, 0), new Point3(w / 2, -h / 2, 0),
                new Point3(w / 2, h / 2, 0), new Point3(-w / 2, h / 2, 0), new Point3(13 - w / 2, 29 - h / 2, 0));
        MatOfPoint2f img = new MatOfPoint2f();
        Calib3d.projectPoints(board, rvec, vec(0, 0, d), k, new MatOfDouble(0, 0, 0, 0), img);
        Point[] expected = img.toArray();
        double[][] ours = {hom.apply(0, 0), hom.apply(w, 0), hom.apply(w, h), hom.apply(0, h), hom.apply(13, 29)};
        for (int i = 0; i < 5; i++) {
            // OpenCV returns single-precision points: 1e-4 px covers float rounding at a few hundred pixels
            assertEquals(expected[i].x, ours[i][0], 1e-4);
            assertEquals(expected[i].y, ours[i][1], 1e-4);
        }
    }

    private static Mat vec(double a, double b, double c) {
        Mat m = new Mat(3, 1, CvType.CV_64F);
        m.put(0, 0, a, b, c);
        return m;
    }

    @Test
    void frontalPoseScalesByFocalOverDistance() {
        Scenario.CameraSpec c = new Scenario.CameraSpec(160, 128, 400, 250, null, null, null, null, null, null, null,
                null, null, null, null, null, null, null, null, null);
        Homography h = CameraModel.basePose(c, 60, 40);
        double pxPerMm = 400 / 250.0; // pinhole: image size = focal x object size / distance
        double[][] corners = CameraModel.corners(h, 60, 40);
        assertEquals(79.5 - 30 * pxPerMm, corners[0][0], 1e-9);
        assertEquals(63.5 - 20 * pxPerMm, corners[0][1], 1e-9);
        assertEquals(79.5 + 30 * pxPerMm, corners[2][0], 1e-9);
        assertEquals(63.5 + 20 * pxPerMm, corners[2][1], 1e-9);
    }

    /**
     * A warm board on a cooler mat, rendered without blur or noise: along each row the board edge lies where the
     * homography puts it. For a straight edge, the summed pixel coverage along a row equals the distance from the
     * row's edge crossing to the far end (area sampling); supersampling 8 x 8 gives about 1/16 px resolution.
     */
    @Test
    void renderedBoardEdgeLiesWhereTheHomographyPutsItWithinATenthPixel() {
        Scenario base = Scenarios.small();
        Scenario.BoardSpec b = new Scenario.BoardSpec("plain", new double[]{60, 40}, null, null, 1.0, null, 1.0, 1.0,
                null, List.of(), List.of(), List.of());
        Scenario.CameraSpec c = new Scenario.CameraSpec(160, 128, 400, 250, 0.0, 0.0, 6.0, new double[]{0.3, 0.2}, null,
                0.0, 0.0, 0.0, null, "f32-tiff", null, null, 8, 1.0, 20.0, null);
        Scenario s = base.withBoard(b).withCamera(c);
        BoardModel bm = new BoardModel(s);
        Renderer r = new Renderer(s, bm);
        r.prepare(10, 50);
        Renderer.Buffers buf = r.buffers();
        float[] cells = new float[bm.nx * bm.ny];
        Arrays.fill(cells, 40f);
        Homography h = CameraModel.basePose(c, 60, 40);
        r.render(cells, new double[0], 20.0, h, 1L, buf);
        // left edge: the line through the TL and BL corners
        double[] tl = h.apply(0, 0), bl = h.apply(0, 40);
        int checked = 0;
        for (int y = 50; y <= 78; y += 4) {
            double xEdge = tl[0] + (y - tl[1]) * (bl[0] - tl[0]) / (bl[1] - tl[1]);
            int x0 = (int) Math.floor(xEdge) - 3, x1 = (int) Math.floor(xEdge) + 4;
            double covered = 0;
            for (int x = x0; x <= x1; x++) covered += (buf.image[y * 160 + x] - 20.0) / 20.0;
            double estimated = (x1 + 0.5) - covered;
            assertEquals(xEdge, estimated, 0.1, "row " + y);
            checked++;
        }
        assertEquals(8, checked);
    }

    /** Temporal noise measured on a static series equals the configured NETD within 10% (read back from float TIFF). */
    @Test
    void temporalNoiseOnStaticSeriesEqualsConfiguredNetd() throws IOException {
        double netd = 0.06;
        Scenario s = Scenarios.small(0.0).withFrames(40, 0.5, 100.0).withMotion(Scenario.Motion.stand(0.0))
                .withNetd(netd).withFixedPattern(0.03).withEncoding(FrameEncoding.F32_TIFF).withSize(96, 64);
        SimulationOutput out = Simulator.run(s, dir);
        int w = 96, h = 64, n = out.frameFiles().size();
        double[] sum = new double[w * h], sum2 = new double[w * h];
        for (Path f : out.frameFiles()) {
            Raster r = ImageIO.read(f.toFile()).getRaster();
            for (int i = 0; i < w * h; i++) {
                double v = r.getSampleDouble(i % w, i / w, 0);
                sum[i] += v;
                sum2[i] += v * v;
            }
        }
        double var = 0;
        for (int i = 0; i < w * h; i++) var += (sum2[i] - sum[i] * sum[i] / n) / (n - 1);
        double measured = Math.sqrt(var / (w * h));
        assertEquals(netd, measured, 0.1 * netd);
    }

    @Test
    void handHeldMotionStaysWithinConfiguredAmplitudesAndUsesThem() {
        Scenario.CameraSpec c = Scenarios.small().withMotion(Scenario.Motion.handheld(5, 0.10, 0.15)).camera();
        Homography[] m = CameraModel.motions(c, 200, 42L);
        double maxAngle = 0, maxScale = 0, maxShift = 0;
        for (Homography h : m) {
            double a = Math.atan2(h.get(1, 0), h.get(0, 0)), sc = Math.hypot(h.get(0, 0), h.get(1, 0));
            double[] centre = h.apply(79.5, 63.5);
            maxAngle = Math.max(maxAngle, Math.abs(Math.toDegrees(a)));
            maxScale = Math.max(maxScale, Math.abs(sc - 1));
            maxShift = Math.max(maxShift, Math.abs(centre[0] - 79.5) / 160);
        }
        assertTrue(maxAngle <= 5 && maxAngle > 4, "rotation " + maxAngle);
        assertTrue(maxScale <= 0.10 + 1e-12 && maxScale > 0.08, "scale " + maxScale);
        assertTrue(maxShift <= 0.15 + 1e-12 && maxShift > 0.12, "translation " + maxShift);
    }
}
