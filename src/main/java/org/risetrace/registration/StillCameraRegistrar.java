package org.risetrace.registration;

import java.util.Locale;
import org.risetrace.board.Board;
import org.risetrace.frame.Frame;

/**
 * For a camera the user declares still (on a stand). A board at ambient seen against a reflected temperature equal
 * to ambient shows no texture at all: no alignment can find it, and every frame would fail. On a stand the outline
 * as marked is the right mapping for every frame, so a frame whose own alignment is not trusted takes it. A frame
 * whose own alignment is trusted (ok) keeps that mapping, which follows a stand's slow drift; when that mapping puts
 * the board clearly away from the marked outline the declaration is wrong for that frame and it fails, saying so.
 */
final class StillCameraRegistrar implements Registrar {
    /** A trusted mapping farther than this from the marked outline (largest corner distance, px) means a move. */
    static final double MOVED_PX = 1.0;

    private final Registrar measured;
    private final Board board;
    private final double[][] markedCorners;
    private final Homography markedBoardToFrame;
    private final int width, height;

    StillCameraRegistrar(Registrar measured, Board board, Frame reference) {
        this.measured = measured;
        this.board = board;
        this.markedCorners = board.outline().cornersPx();
        this.markedBoardToFrame = Homographies.boardToFrame(board, markedCorners);
        this.width = reference.width();
        this.height = reference.height();
    }

    @Override
    public FrameRegistration register(Frame frame) {
        FrameRegistration own = measured.register(frame);
        if (own.status() == RegistrationStatus.MARKED) return own;
        if (frame.width() != width || frame.height() != height) return own; // a different camera or crop
        if (own.status() == RegistrationStatus.OK) {
            double moved = largestCornerDistance(own.boardCornersPx(),
                    Homographies.boardCorners(board, markedBoardToFrame));
            double sigma = Double.isFinite(own.cornerSigmaPx()) ? own.cornerSigmaPx() : 0;
            if (moved > MOVED_PX && moved > 3 * sigma)
                return new FrameRegistration(own.file(), own.tSeconds(), RegistrationStatus.FAILED, String.format(
                        Locale.ROOT, "the camera was declared still, but this frame's own alignment (ok, estimated "
                                + "corner error %.2f px) puts the board %.1f px from the marked outline: the camera "
                                + "moved", sigma, moved), null, null, own.inliers(), own.rmsPx(), own.similarity());
            return own;
        }
        String why = "camera declared still: the outline as marked"
                + (own.reason() == null ? "" : " (own alignment " + own.status().word() + ": " + own.reason() + ")");
        // the marked outline is the board's definition on a still camera: no mapping error is estimated (a stand's
        // drift is not measured on a frame that cannot be aligned; README, "Plain boards")
        return new FrameRegistration(own.file(), own.tSeconds(), RegistrationStatus.MARKED, why, markedBoardToFrame,
                Homographies.boardCorners(board, markedBoardToFrame), 0, Double.NaN, Double.NaN, 0.0);
    }

    private static double largestCornerDistance(double[][] a, double[][] b) {
        double worst = 0;
        for (int i = 0; i < 4; i++) worst = Math.max(worst, Math.hypot(a[i][0] - b[i][0], a[i][1] - b[i][1]));
        return worst;
    }
}
