package org.risetrace.registration;

import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.risetrace.board.Board;
import org.risetrace.frame.Frame;

import java.util.Random;

@Tag("benchmark")
class RegistrationProbe {
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
