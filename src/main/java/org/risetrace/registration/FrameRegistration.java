package org.risetrace.registration;

/**
 * The mapping of one frame onto the board and how far it can be trusted.
 *
 * @param file            frame file name
 * @param tSeconds        frame time in the series
 * @param status          ok, weak, failed or marked
 * @param reason          why weak or failed (null when ok)
 * @param boardToFrame    board millimetres to frame pixels (null when failed)
 * @param boardCornersPx  the four board corners in this frame's pixels, outline order (null when failed)
 * @param inliers         feature correspondences consistent with the mapping
 * @param rmsPx           residual RMS of those correspondences in pixels (NaN when not measured)
 * @param similarity      image similarity over the board after alignment, -1..1 (NaN when not measured)
 * @param cornerSigmaPx   estimated RMS error of the four board corners in frame pixels, from the alignment's
 *                        normal equations and the check patches, calibrated against simulated truth (NaN when
 *                        failed or not measured; 0 for a frame whose corners were marked)
 */
public record FrameRegistration(String file, double tSeconds, RegistrationStatus status, String reason,
                                Homography boardToFrame, double[][] boardCornersPx,
                                int inliers, double rmsPx, double similarity, double cornerSigmaPx) {

    /** A registration without an uncertainty estimate. */
    public FrameRegistration(String file, double tSeconds, RegistrationStatus status, String reason,
                             Homography boardToFrame, double[][] boardCornersPx, int inliers, double rmsPx,
                             double similarity) {
        this(file, tSeconds, status, reason, boardToFrame, boardCornersPx, inliers, rmsPx, similarity, Double.NaN);
    }
}
