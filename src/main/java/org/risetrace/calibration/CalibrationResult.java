package org.risetrace.calibration;

import java.util.List;

/**
 * What a reference-target calibration produced.
 *
 * @param profile                 the new profile (linear encoding; for Sakuma-Hattori the linearised curve)
 * @param model                   the model fitted
 * @param points                  the reference points, in the order the targets were given
 * @param modelC                  the fitted model's temperature at each point's signal, degrees Celsius
 * @param residualK               model minus known temperature at each point, kelvin
 * @param profileResidualK        new profile minus known temperature at each point, kelvin (equals residualK for the
 *                                linear models; adds the linearisation error for Sakuma-Hattori)
 * @param curve                   the fitted Sakuma-Hattori curve, or null
 * @param linearisationMaxErrorK  largest difference between the curve and its linearisation over the calibrated
 *                                signal range, kelvin (0 for the linear models)
 * @param rangeC                  [lowest, highest] known temperature, degrees Celsius
 * @param notes                   warnings for the user: non-uniform targets, large residuals, an implausible curve
 */
public record CalibrationResult(Profile profile, CalibrationModel model, List<ReferencePoint> points, double[] modelC,
                                double[] residualK, double[] profileResidualK, SakumaHattori curve,
                                double linearisationMaxErrorK, double[] rangeC, List<String> notes) {

    /** Root-mean-square of the profile residuals, kelvin. */
    public double rmsResidualK() {
        double s = 0;
        for (double r : profileResidualK) s += r * r;
        return Math.sqrt(s / profileResidualK.length);
    }

    /** Largest absolute profile residual, kelvin. */
    public double maxResidualK() {
        double m = 0;
        for (double r : profileResidualK) m = Math.max(m, Math.abs(r));
        return m;
    }
}
