package org.risetrace.registration;

import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.risetrace.board.Board;
import org.risetrace.frame.Frame;

import java.util.Random;

@Tag("benchmark")
class RegistrationProbe {
    @Test
    void degenerate() {
        int w = 160, h = 128;
        for (int s = 0; s < 4; s++) {
            SyntheticScene sc = new SyntheticScene(200 + s);
            double[][] rc = SyntheticScene.referenceCorners(w, h);
            Board b = sc.board("ref.png", rc);
            Frame ref = sc.render(w, h, Homographies.boardToFrame(b, rc), 0, 0.05, 1, "ref.png");
            Registrar reg = Registrars.create(ref, b, RegistrationConfig.defaults());
            float[] u = new float[w * h];
            java.util.Arrays.fill(u, 25f);
            Random r = new Random(s);
            for (int i = 0; i < u.length; i++) u[i] += (float) (0.05 * r.nextGaussian());
            Frame uni = new Frame(w, h, u, 0, null, java.nio.file.Path.of("u.png"), "", ref.decoding());
            SyntheticScene other = new SyntheticScene(900 + s);
            Frame diff = other.render(w, h, Homographies.boardToFrame(b, rc), 0, 0.05, 2, "d.png");
            Frame diff2 = other.render(w, h, Homographies.boardToFrame(b, SyntheticScene.moved(rc, w, h, 3, 1.05, 5, 3)), 0, 0.05, 2, "d2.png");
            // hot: every part heated by a different large amount
            float[] hot = sc.render(w, h, Homographies.boardToFrame(b, rc), 0, 0.05, 3, "h.png").celsius().clone();
            Random q = new Random(77 + s);
            for (int k = 0; k < 40; k++) {
                int cx = q.nextInt(w), cy = q.nextInt(h); double a = 10 + 30 * q.nextDouble(), sg = 3 + 10 * q.nextDouble();
                for (int y = 0; y < h; y++) for (int x = 0; x < w; x++) hot[y * w + x] += (float) (a * Math.exp(-((x - cx) * (x - cx) + (y - cy) * (y - cy)) / (2 * sg * sg)));
            }
            Frame hf = new Frame(w, h, hot, 0, null, java.nio.file.Path.of("h.png"), "", ref.decoding());
            for (Frame f : new Frame[]{uni, diff, diff2, hf}) {
                FrameRegistration g = reg.register(f);
                System.out.printf("deg %d %s %s sim %.3f rms %.3f inl %d %s%n", s, f.fileName(), g.status(), g.similarity(), g.rmsPx(), g.inliers(), g.reason());
            }
        }
    }

    @Test
    void probe() {
        int w = 160, h = 128;
        Random r = new Random(5);
        for (int s = 0; s < 6; s++) {
            SyntheticScene sc = new SyntheticScene(100 + s);
            double[][] rc = SyntheticScene.referenceCorners(w, h);
            Board b = sc.board("ref.png", rc);
            Frame ref = sc.render(w, h, Homographies.boardToFrame(b, rc), 0, 0.05, 1, "ref.png");
            Registrar reg = Registrars.create(ref, b, RegistrationConfig.defaults());
            for (int f = 0; f < 8; f++) {
                boolean hand = f >= 4;
                double[][] c = hand ? SyntheticScene.moved(rc, w, h, (r.nextDouble() * 2 - 1) * 5, 1 + (r.nextDouble() * 2 - 1) * 0.1,
                        (r.nextDouble() * 2 - 1) * 0.15 * w, (r.nextDouble() * 2 - 1) * 0.1 * h)
                        : SyntheticScene.moved(rc, w, h, 0, 1, r.nextDouble() - 0.5, r.nextDouble() - 0.5);
                Frame fr = sc.render(w, h, Homographies.boardToFrame(b, c), f * 1.0, 0.05, 10 + f, "f" + f + ".png");
                long t0 = System.nanoTime();
                FrameRegistration g = reg.register(fr);
                long t1 = System.nanoTime();
                double err = g.boardCornersPx() == null ? Double.NaN : SyntheticScene.cornerError(g.boardCornersPx(), c);
                System.out.printf("scene %d frame %d %s %s err %.3f sim %.3f rms %.3f inl %d %.1f ms %s%n", s, f, hand ? "hand" : "stand",
                        g.status(), err, g.similarity(), g.rmsPx(), g.inliers(), (t1 - t0) / 1e6, g.reason());
            }
        }
    }
}
