package org.risetrace.cli;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.calibration.Profile;
import org.risetrace.calibration.Profiles;
import picocli.CommandLine;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

class CalibrateCommandTest {
    private static final int W = 80, H = 60;

    /** Counts of a camera reading 2 % high and 1.2 K warm against the centikelvin scale. */
    private static int count(double trueC) {
        return (int) Math.round(((trueC + 273.15) * 1.02 + 1.2) * 100);
    }

    /**
     * A 16-bit binary PGM (netpbm: "P5 width height maxval", one whitespace, samples of 2 bytes, most significant
     * first) with three 10x10 targets at 35, 65 and 95 C on a 23 C background, plus 0.04 K noise.
     */
    private static void writeFrame(Path file, long seed) throws IOException {
        Random r = new Random(seed);
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        out.write(("P5\n" + W + " " + H + "\n65535\n").getBytes(StandardCharsets.US_ASCII));
        for (int y = 0; y < H; y++)
            for (int x = 0; x < W; x++) {
                double c = 23;
                if (y >= 20 && y < 30) {
                    if (x >= 5 && x < 15) c = 35;
                    else if (x >= 35 && x < 45) c = 65;
                    else if (x >= 65 && x < 75) c = 95;
                }
                int v = count(c) + (int) Math.round(r.nextGaussian() * 4);
                out.write(v >> 8);
                out.write(v & 0xFF);
            }
        Files.write(file, out.toByteArray());
    }

    private record Run(int exit, String out, String err) {
    }

    private static Run run(String... args) {
        CommandLine cl = Main.commandLine();
        StringWriter out = new StringWriter(), err = new StringWriter();
        cl.setOut(new PrintWriter(out, true));
        cl.setErr(new PrintWriter(err, true));
        int code = cl.execute(args);
        return new Run(code, out.toString(), err.toString());
    }

    private static final String[] TARGETS = {"--target", "5,20,10,10=35", "--target", "35,20,10,10=65",
            "--target", "65,20,10,10=95"};

    private static String[] args(Path frames, Path out, String name, String... more) {
        String[] base = {"calibrate", "--frames", frames.toString(), "--name", name, "--out", out.toString(),
                "--profile", "u16-centikelvin"};
        String[] all = new String[base.length + TARGETS.length + more.length];
        System.arraycopy(base, 0, all, 0, base.length);
        System.arraycopy(TARGETS, 0, all, base.length, TARGETS.length);
        System.arraycopy(more, 0, all, base.length + TARGETS.length, more.length);
        return all;
    }

    @Test
    void writesAProfileThatReadsTheTargetsAtTheirKnownTemperatures(@TempDir Path dir) throws IOException {
        Path frames = Files.createDirectories(dir.resolve("blocks"));
        for (int i = 0; i < 3; i++) writeFrame(frames.resolve("f" + i + ".pgm"), i);
        Path out = dir.resolve("cal");
        Run r = run(args(frames, out, "bench-cam"));
        assertEquals(0, r.exit(), r.err());
        assertTrue(r.out().contains("wrote") && r.out().contains("resid K"), r.out());

        Profile p = Profiles.load(out.resolve("bench-cam.json").toString());
        // the known inverse of the simulated error: T_K = (0.01 count - 1.2) / 1.02
        assertEquals(0.01 / 1.02, p.gain(), 1e-6);
        for (double known : new double[]{35, 65, 95})
            assertEquals(known, p.countToCelsius(count(known)), 0.02, "target at " + known + " C");
        // the uncalibrated base profile was more than 1.5 K off at 35 C: the fit is what made it right
        assertTrue(Math.abs(Profiles.load("u16-centikelvin").countToCelsius(count(35)) - 35) > 1.5);

        // a second run must not replace it
        String before = Files.readString(out.resolve("bench-cam.json"));
        Run again = run(args(frames, out, "bench-cam"));
        assertEquals(Main.EXIT_INPUT_REJECTED, again.exit());
        assertTrue(again.err().contains("exists") && again.err().lines().count() == 1, again.err());
        assertEquals(before, Files.readString(out.resolve("bench-cam.json")));
        assertEquals(0, run(args(frames, out, "bench-cam", "--force", "--model", "offset")).exit());
    }

    @Test
    void sakumaHattoriWritesTheCurveBesideTheProfile(@TempDir Path dir) throws IOException {
        Path f = dir.resolve("one.pgm");
        writeFrame(f, 7);
        Run r = run(args(f, dir, "sh-cam", "--model", "sakuma-hattori"));
        assertEquals(0, r.exit(), r.err());
        assertTrue(Files.isRegularFile(dir.resolve("sh-cam.sakuma-hattori.json")));
        assertTrue(r.out().contains("Sakuma-Hattori"), r.out());
        Profile p = Profiles.load(dir.resolve("sh-cam.json").toString());
        assertEquals(65, p.countToCelsius(count(65)), 0.1);
    }

    @Test
    void mistakesGiveOneLineAndTheRightExitCode(@TempDir Path dir) throws IOException {
        Path f = dir.resolve("one.pgm");
        writeFrame(f, 3);
        // usage errors: exit 2
        assertEquals(Main.EXIT_USAGE, run("calibrate", "--frames", f.toString(), "--name", "x",
                "--target", "5,20,10=35").exit());
        assertEquals(Main.EXIT_USAGE, run(args(f, dir, "x", "--model", "cubic")).exit());
        // rejected inputs: exit 1, one line, nothing written
        Run outside = run("calibrate", "--frames", f.toString(), "--name", "x", "--out", dir.toString(),
                "--profile", "u16-centikelvin", "--target", "75,20,10,10=35");
        assertEquals(Main.EXIT_INPUT_REJECTED, outside.exit());
        assertEquals(1, outside.err().lines().count(), outside.err());
        Run fewPoints = run("calibrate", "--frames", f.toString(), "--name", "x", "--out", dir.toString(),
                "--model", "sakuma-hattori", "--target", "5,20,10,10=35");
        assertEquals(Main.EXIT_INPUT_REJECTED, fewPoints.exit());
        assertEquals(Main.EXIT_INPUT_REJECTED, run(args(dir.resolve("missing"), dir, "x")).exit());
        assertEquals(Main.EXIT_USAGE, run(args(f, dir, "x", "--target", "1,1,2,2=-300")).exit());
        // a float profile cannot read 16-bit counts, and calibrate adjusts only linear profiles
        assertEquals(Main.EXIT_INPUT_REJECTED, run("calibrate", "--frames", f.toString(), "--name", "x",
                "--out", dir.toString(), "--profile", "f32-celsius", "--target", "5,20,10,10=35").exit());
        assertEquals(Main.EXIT_INPUT_REJECTED, run(args(f, dir, "../x")).exit());
        assertFalse(Files.exists(dir.resolve("x.json")));
    }
}
