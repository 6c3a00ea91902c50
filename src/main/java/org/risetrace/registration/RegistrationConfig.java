package org.risetrace.registration;

/**
 * Settings of automatic registration and the thresholds that grade each frame.
 *
 * @param method             "auto" (fast path from the last estimate, then coarse search, then features),
 *                           "features" (always start from BoofCV features + RANSAC) or "search" (coarse search only)
 * @param pyramidLevels      levels of the coarse-to-fine pyramid; 0 picks them from the frame size
 * @param okSimilarity       at least this image similarity over the board for ok
 * @param failSimilarity     below this the frame failed
 * @param okRmsPx            at most this residual of the check patches for ok
 * @param failRmsPx          above this the frame failed
 * @param okInlierFraction   at least this fraction of check patches agreeing for ok
 * @param failInlierFraction below this the frame failed
 * @param maxScaleChange     largest plausible zoom factor of the board relative to the reference (either way)
 * @param maxAngleChangeDeg  largest plausible change of a corner angle of the board outline (perspective/shear)
 * @param minVisibleFraction below this fraction of the board inside the frame the frame failed
 */
public record RegistrationConfig(String method, int pyramidLevels,
                                 double okSimilarity, double failSimilarity,
                                 double okRmsPx, double failRmsPx,
                                 double okInlierFraction, double failInlierFraction,
                                 double maxScaleChange, double maxAngleChangeDeg, double minVisibleFraction) {

    public RegistrationConfig {
        if (!method.equals("auto") && !method.equals("features") && !method.equals("search"))
            throw new IllegalArgumentException("method must be auto, features or search: " + method);
    }

    /** Thresholds chosen on simulated series (DEVELOPERS.md, registration). */
    public static RegistrationConfig defaults() {
        return new RegistrationConfig("auto", 0, 0.6, 0.3, 0.35, 1.0, 0.6, 0.35, 1.6, 20, 0.35);
    }

    public RegistrationConfig withMethod(String m) {
        return new RegistrationConfig(m, pyramidLevels, okSimilarity, failSimilarity, okRmsPx, failRmsPx,
                okInlierFraction, failInlierFraction, maxScaleChange, maxAngleChangeDeg, minVisibleFraction);
    }
}
