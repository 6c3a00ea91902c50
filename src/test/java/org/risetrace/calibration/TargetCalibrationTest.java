package org.risetrace.calibration;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.frame.Decoding;
import org.risetrace.frame.Frame;
import org.risetrace.frame.InputRejected;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

class TargetCalibrationTest {
    private static final Profile CENTIKELVIN = Profiles.load("u16-centikelvin");

    /** A camera whose counts read 1.5 % high and 0.8 K warm under the centikelvin profile. */
    private static double miscalibratedCount(double trueC) {
        return ((trueC + 273.15) * 1.015 + 0.8) / 0.01;
    }

    /** A 64x48 frame (what the base profile makes of the counts) with square targets at the given temperatures. */
    private static Frame frame(String name, double ambientC, double[] targetC, int[][] boxes, double noiseK, long seed) {
        int w = 64, h = 48;
        float[] c = new float[w * h];
        Random r = new Random(seed);
        for (int i = 0; i < c.length; i++)
            c[i] = (float) CENTIKELVIN.countToCelsius(Math.round(miscalibratedCount(ambientC) + r.nextGaussian() * noiseK * 100));
        for (int t = 0; t < targetC.length; t++)
            for (int y = boxes[t][1]; y < boxes[t][1] + boxes[t][3]; y++)
                for (int x = boxes[t][0]; x < boxes[t][0] + boxes[t][2]; x++)
                    c[y * w + x] = (float) CENTIKELVIN.countToCelsius(
                            Math.round(miscalibratedCount(targetC[t]) + r.nextGaussian() * noiseK * 100));
        return new Frame(w, h, c, 0, null, Path.of(name), "0", new Decoding("pgm", 16, "u16-centikelvin", ""));
    }

    private static final int[][] BOXES = {{4, 4, 8, 8}, {20, 4, 8, 8}, {36, 4, 8, 8}, {4, 24, 8, 8}};
    private static final double[] KNOWN = {30, 55, 80, 105};

    private static List<ReferenceTarget> targets() {
        List<ReferenceTarget> t = new ArrayList<>();
        for (int i = 0; i < KNOWN.length; i++)
            t.add(new ReferenceTarget(BOXES[i][0], BOXES[i][1], BOXES[i][2], BOXES[i][3], KNOWN[i], null));
        return t;
    }

    @Test
    void gainOffsetFitRemovesALinearErrorAndTheProfileReloads(@TempDir Path dir) {
        List<Frame> frames = List.of(frame("a.pgm", 22, KNOWN, BOXES, 0.05, 1), frame("b.pgm", 22, KNOWN, BOXES, 0.05, 2));
        CalibrationResult r = TargetCalibration.calibrate(frames, targets(), CENTIKELVIN, CalibrationModel.GAIN_OFFSET, "bench-a");
        // the true inverse of the simulated error: T_K = (0.01 count - 0.8) / 1.015 -> gain 0.01/1.015, offset -0.8/1.015
        assertEquals(0.01 / 1.015, r.profile().gain(), 1e-6);
        assertEquals(-0.8 / 1.015, r.profile().offset(), 0.05);
        // noise of 0.05 K averaged over 128 pixels: residuals far below the NETD
        assertTrue(r.maxResidualK() < 0.02, "residuals " + r.maxResidualK());
        assertTrue(r.notes().isEmpty(), r.notes().toString());

        Path written = ProfileWriter.write(r, dir, false).get(0);
        Profile loaded = Profiles.load(written.toString());
        for (int i = 0; i < KNOWN.length; i++) {
            double c = loaded.countToCelsius(r.points().get(i).signal());
            assertEquals(KNOWN[i], c, Math.abs(r.profileResidualK()[i]) + 1e-9, "target " + i);
        }
        assertEquals(CENTIKELVIN.bandUm()[0], loaded.bandUm()[0], 0.0);
        assertEquals("linear", loaded.encoding());
    }

    @Test
    void aGainFarFromTheBaseProfilesIsFlagged() {
        // two regions 14 counts (0.14 K on the centikelvin base) apart given as 30 and 60 degC: the fit is exact and
        // its gain 214 times the base one; a camera's response drifts by per cent (common practice), so the regions
        // and values do not belong together, and two targets cannot show it in their residuals
        List<ReferencePoint> pts = List.of(ReferencePoint.of(30315, 30), ReferencePoint.of(30329, 60));
        CalibrationResult r = TargetCalibration.fit(CENTIKELVIN, pts, CalibrationModel.GAIN_OFFSET, "bad");
        assertEquals(30.0 / 14 / 0.01, r.profile().gain() / 0.01, 1e-6 * 214);
        assertTrue(r.notes().stream().anyMatch(n -> n.contains("times the base profile's")
                && n.contains("differ by 0.140 K on the base profile where their known temperatures differ by 30.0 K")),
                r.notes().toString());
        assertTrue(r.notes().stream().anyMatch(n -> n.contains("two targets determine gain and offset exactly")));
        // a plausible two-point correction (1.5 % gain) is not flagged for its gain
        List<ReferencePoint> ok = List.of(ReferencePoint.of(miscalibratedCount(40), 40),
                ReferencePoint.of(miscalibratedCount(60), 60));
        CalibrationResult good = TargetCalibration.fit(CENTIKELVIN, ok, CalibrationModel.GAIN_OFFSET, "good");
        assertTrue(good.notes().stream().noneMatch(n -> n.contains("times the base profile's")), good.notes().toString());
    }

    @Test
    void offsetFitKeepsTheGainAndCentresTheResiduals() {
        List<ReferencePoint> pts = List.of(ReferencePoint.of(miscalibratedCount(40), 40), ReferencePoint.of(miscalibratedCount(60), 60));
        CalibrationResult r = TargetCalibration.fit(CENTIKELVIN, pts, CalibrationModel.OFFSET, "o");
        assertEquals(0.01, r.profile().gain(), 0.0);
        // least squares with a fixed gain: residuals sum to zero
        assertEquals(0, r.residualK()[0] + r.residualK()[1], 1e-9);
        // one point is enough for an offset, and it is then met exactly
        CalibrationResult one = TargetCalibration.fit(CENTIKELVIN, pts.subList(0, 1), CalibrationModel.OFFSET, "o1");
        assertEquals(0, one.residualK()[0], 1e-9);
    }

    @Test
    void sakumaHattoriFitOfARawSignalCameraWritesCurveAndLinearisation(@TempDir Path dir) throws IOException {
        // a raw-signal camera: counts proportional to 7.5-14 um band radiance (Planck), dark signal subtracted
        double[] known = {25, 40, 55, 70, 85};
        List<ReferencePoint> pts = new ArrayList<>();
        for (double k : known) pts.add(ReferencePoint.of(300 * Planck.bandRadiance(7.5, 14, k + 273.15), k));
        CalibrationResult r = TargetCalibration.fit(CENTIKELVIN, pts, CalibrationModel.SAKUMA_HATTORI, "raw-cam");
        // Sakuma-Hattori interpolates band radiance to millikelvins (its purpose: Sakuma and Hattori 1982)
        for (double res : r.residualK()) assertEquals(0, res, 0.01);
        // band radiance grows about as T^4.7 near 300 K in this band (Planck), so over 60 K no straight line follows it: the user is told
        assertTrue(r.linearisationMaxErrorK() > 0.5, "linearisation " + r.linearisationMaxErrorK());
        assertTrue(r.notes().stream().anyMatch(n -> n.contains("straight line departs")), r.notes().toString());
        // the linear profile is an approximation: the reported error bounds the profile's residuals
        for (double res : r.profileResidualK()) assertTrue(Math.abs(res) <= r.linearisationMaxErrorK() + 0.01);
        List<Path> files = ProfileWriter.write(r, dir, false);
        assertEquals(2, files.size());
        JsonNode curve = new ObjectMapper().readTree(files.get(1).toFile());
        assertEquals(r.curve().aUm(), curve.get("a_um").asDouble(), 0.0);
        assertEquals(5, curve.get("points").size());
        Profile loaded = Profiles.load(files.get(0).toString());
        assertEquals(r.profile().gain(), loaded.gain(), 0.0);
    }

    @Test
    void existingProfilesAreNeverReplacedWithoutForce(@TempDir Path dir) throws IOException {
        List<ReferencePoint> pts = List.of(ReferencePoint.of(31315, 40.5), ReferencePoint.of(33315, 60.2));
        CalibrationResult r = TargetCalibration.fit(CENTIKELVIN, pts, CalibrationModel.GAIN_OFFSET, "mine");
        Path existing = dir.resolve("mine.json");
        Files.writeString(existing, "keep me");
        InputRejected e = assertThrows(InputRejected.class, () -> ProfileWriter.write(r, dir, false));
        assertTrue(e.getMessage().contains("nothing was written"), e.getMessage());
        assertEquals("keep me", Files.readString(existing));
        ProfileWriter.write(r, dir, true);
        assertEquals(r.profile().gain(), Profiles.load(existing.toString()).gain(), 0.0);
        // a bundled profile's name would shadow it for every series in this folder
        CalibrationResult bundled = TargetCalibration.fit(CENTIKELVIN, pts, CalibrationModel.GAIN_OFFSET, "u16-centikelvin");
        assertThrows(InputRejected.class, () -> ProfileWriter.write(bundled, dir, false));
        assertFalse(Files.exists(dir.resolve("u16-centikelvin.json")));
        assertThrows(InputRejected.class, () -> ProfileWriter.requireName("../evil"));
    }

    @Test
    void badTargetsAndTooFewPointsAreRejected() {
        List<Frame> frames = List.of(frame("a.pgm", 22, KNOWN, BOXES, 0, 1));
        assertThrows(InputRejected.class, () -> TargetCalibration.calibrate(frames,
                List.of(new ReferenceTarget(60, 40, 8, 8, 30, null)), CENTIKELVIN, CalibrationModel.OFFSET, "x"));
        assertThrows(InputRejected.class, () -> TargetCalibration.calibrate(frames,
                List.of(new ReferenceTarget(4, 4, 8, 8, 30, "other.pgm")), CENTIKELVIN, CalibrationModel.OFFSET, "x"));
        InputRejected e = assertThrows(InputRejected.class, () -> TargetCalibration.calibrate(frames,
                targets().subList(0, 2), CENTIKELVIN, CalibrationModel.SAKUMA_HATTORI, "x"));
        assertTrue(e.getMessage().contains("3 or more"), e.getMessage());
        // swapped known values: the warmer target reads lower
        List<ReferencePoint> swapped = List.of(ReferencePoint.of(31315, 60), ReferencePoint.of(33315, 40));
        assertThrows(InputRejected.class, () -> TargetCalibration.fit(CENTIKELVIN, swapped, CalibrationModel.GAIN_OFFSET, "x"));
        assertThrows(InputRejected.class, () -> TargetCalibration.fit(Profiles.load("f32-celsius"),
                swapped, CalibrationModel.OFFSET, "x"));
    }

    @Test
    void oneTargetHeatedInTurnIsReadInItsOwnFrames() {
        // one block at 30, 60 and 90 C in three frames: each target names its frame, the others are not averaged in
        int[][] box = {BOXES[0]};
        List<Frame> frames = List.of(frame("t30.pgm", 22, new double[]{30}, box, 0.0, 1),
                frame("t60.pgm", 22, new double[]{60}, box, 0.0, 2), frame("t90.pgm", 22, new double[]{90}, box, 0.0, 3));
        List<ReferenceTarget> t = List.of(ReferenceTarget.parse("4,4,8,8=30@t30.pgm"),
                ReferenceTarget.parse("4,4,8,8=60@t60.pgm"), ReferenceTarget.parse("4,4,8,8=90@t90.pgm"));
        CalibrationResult r = TargetCalibration.calibrate(frames, t, CENTIKELVIN, CalibrationModel.GAIN_OFFSET, "turns");
        assertEquals(64, r.points().get(1).pixels());
        // noise-free counts rounded to whole counts of 0.01 K: residuals within a count
        assertTrue(r.maxResidualK() < 0.01, "residuals " + r.maxResidualK());
        assertEquals(0.01 / 1.015, r.profile().gain(), 1e-6);
    }

    @Test
    void misplacedTargetsAndAnImplausibleCurveAreNoted() {
        // a region half on the 30 C target and half on the 22 C background
        List<Frame> frames = List.of(frame("a.pgm", 22, KNOWN, BOXES, 0.05, 1));
        List<ReferenceTarget> t = new ArrayList<>(targets());
        t.set(0, new ReferenceTarget(0, 4, 8, 8, 30, null));
        CalibrationResult r = TargetCalibration.calibrate(frames, t, CENTIKELVIN, CalibrationModel.GAIN_OFFSET, "x");
        assertTrue(r.notes().stream().anyMatch(n -> n.contains("not uniform")), r.notes().toString());
        assertTrue(r.notes().stream().anyMatch(n -> n.contains("exceed 3 x NETD")), r.notes().toString());
        // counts linear in temperature are not radiance: the Sakuma-Hattori curve's wavelength runs off the band
        CalibrationResult sh = TargetCalibration.calibrate(frames, targets(), CENTIKELVIN, CalibrationModel.SAKUMA_HATTORI, "y");
        assertTrue(sh.notes().stream().anyMatch(n -> n.contains("effective wavelength")), sh.notes().toString());
    }

    @Test
    void targetSyntaxParses() {
        ReferenceTarget t = ReferenceTarget.parse(" 10, 20,5,6 = 85.5 @ hot.png");
        assertEquals(new ReferenceTarget(10, 20, 5, 6, 85.5, "hot.png"), t);
        assertEquals(new ReferenceTarget(0, 0, 1, 1, -10, null), ReferenceTarget.parse("0,0,1,1=-10"));
        for (String bad : new String[]{"1,2,3=4", "1,2,3,4", "a,2,3,4=5", "1,2,3,4=warm", "1,2,0,4=5", "1,2,3,4=-300", "1,2,3,4=5@"})
            assertThrows(IllegalArgumentException.class, () -> ReferenceTarget.parse(bad), bad);
    }
}
