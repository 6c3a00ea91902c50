package org.risetrace.registration;

/**
 * What is known of one mapping's error at the board corners, before calibration, in squared frame pixels: the
 * alignment's own variance from its normal equations, and the squared correction that the check patches imply at
 * the corners. A chain link's mapping is composed with its earlier frame's, and independent errors add, so the
 * parts of both are summed and {@code mappings} counts how many were composed. {@link #cornerSigmaPx()} combines
 * the parts with the factors calibrated on simulated series with truth from two different generators
 * (DEVELOPERS.md, "Mapping uncertainty").
 *
 * @param alignVariance  sum over the composed mappings of the mean over the corners of trace(J C J^T) of the
 *                       alignment, frame px^2 (0 when not measured)
 * @param patchBias2     sum of the mean squared corner displacement of the similarity fitted to the agreeing check
 *                       patches' residual shifts, frame px^2 (0 with fewer than three patches)
 * @param patchNoiseVar  that fit's own variance at the corners, frame px^2, of the last mapping (NaN with fewer
 *                       than five patches; reported, not used)
 * @param mappings       mappings composed (1 direct, 2 through a chain link, ...); 0 when nothing was measured
 */
record MappingUncertainty(double alignVariance, double patchBias2, double patchNoiseVar, int mappings) {

    static final MappingUncertainty NONE = new MappingUncertainty(0, 0, Double.NaN, 0);

    /**
     * Calibrated factors (see DEVELOPERS.md): the alignment's variance is multiplied by ALIGN_FACTOR (its residuals
     * are spatially correlated, so s^2 H^-1 understates it), the patches' implied correction by PATCH_FACTOR, and
     * every composed mapping adds FLOOR_PX^2 (interpolation and the band-pass's response to heating, which neither
     * term sees).
     */
    static final double ALIGN_FACTOR = 2.0, PATCH_FACTOR = 0.5, FLOOR_PX = 0.0;

    /** One direct mapping; reference-pixel variances scaled by zoom^2 into frame pixels. */
    static MappingUncertainty direct(double alignVarianceRefPx2, double patchBias2RefPx2, double patchNoiseRefPx2,
                                     double zoom) {
        double z2 = Double.isFinite(zoom) && zoom > 0 ? zoom * zoom : 1;
        boolean any = Double.isFinite(alignVarianceRefPx2) || Double.isFinite(patchBias2RefPx2);
        return new MappingUncertainty(Double.isFinite(alignVarianceRefPx2) ? z2 * alignVarianceRefPx2 : 0,
                Double.isFinite(patchBias2RefPx2) ? z2 * patchBias2RefPx2 : 0, z2 * patchNoiseRefPx2, any ? 1 : 0);
    }

    /** This mapping composed after an earlier one (a chain link after the frame it links to). */
    MappingUncertainty after(MappingUncertainty earlier) {
        if (earlier == null || earlier.mappings == 0) return this;
        return new MappingUncertainty(alignVariance + earlier.alignVariance, patchBias2 + earlier.patchBias2,
                patchNoiseVar, mappings + earlier.mappings);
    }

    /** Estimated RMS error of the four board corners in frame pixels; NaN when nothing was measured. */
    double cornerSigmaPx() {
        if (mappings == 0) return Double.NaN;
        return Math.sqrt(ALIGN_FACTOR * alignVariance + PATCH_FACTOR * patchBias2 + mappings * FLOOR_PX * FLOOR_PX);
    }
}
