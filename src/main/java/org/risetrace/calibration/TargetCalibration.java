package org.risetrace.calibration;

import org.risetrace.frame.Frame;
import org.risetrace.frame.InputRejected;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;

/**
 * Reference-target calibration: frames of targets at known temperatures (read through a linear base profile), the
 * mean count in each target's region, and an offset, gain-and-offset or Sakuma-Hattori fit of temperature to count.
 */
public final class TargetCalibration {
    /** Samples of the calibrated signal range used to linearise a Sakuma-Hattori curve. */
    private static final int LINEARISATION_SAMPLES = 256;

    private TargetCalibration() {
    }

    /** Measures the targets, then fits: what {@code risetrace calibrate} does before writing. */
    public static CalibrationResult calibrate(List<Frame> frames, List<ReferenceTarget> targets, Profile base,
                                              CalibrationModel model, String name) {
        requireLinear(base);
        return fit(base, measure(frames, targets, base), model, name);
    }

    /**
     * The mean count of each target over its pixels in every frame it applies to. Counts are recovered from the
     * frames' temperatures by inverting the base profile (exact for a linear profile up to float rounding, far
     * below one count).
     */
    public static List<ReferencePoint> measure(List<Frame> frames, List<ReferenceTarget> targets, Profile base) {
        requireLinear(base);
        if (frames.isEmpty()) throw new InputRejected(null, "no frames to calibrate from");
        if (targets.isEmpty()) throw new InputRejected(null, "no reference targets given", "add --target x,y,w,h=T_C");
        Set<String> names = new HashSet<>();
        for (Frame f : frames) names.add(f.fileName());
        List<ReferencePoint> points = new ArrayList<>();
        for (ReferenceTarget t : targets) {
            if (t.frameName() != null && !names.contains(t.frameName()))
                throw new InputRejected(null, "target " + t + " names frame '" + t.frameName()
                        + "', which is not among the frames given");
            double countSum = 0, cSum = 0, cSq = 0;
            long n = 0;
            for (Frame f : frames) {
                if (t.frameName() != null && !t.frameName().equals(f.fileName())) continue;
                if (t.x() + t.w() > f.width() || t.y() + t.h() > f.height())
                    throw new InputRejected(f.source(), "target " + t + " reaches outside the " + f.width() + "x"
                            + f.height() + " frame", "target regions are x,y,w,h in frame pixels from the top left");
                for (int y = t.y(); y < t.y() + t.h(); y++)
                    for (int x = t.x(); x < t.x() + t.w(); x++) {
                        float c = f.at(x, y);
                        if (Float.isNaN(c)) continue;
                        countSum += base.celsiusToCount(c);
                        cSum += c;
                        cSq += (double) c * c;
                        n++;
                    }
            }
            if (n == 0) throw new InputRejected(null, "target " + t + " has no pixel with a reading in any frame");
            double mean = cSum / n;
            double spread = Math.sqrt(Math.max(0, cSq / n - mean * mean));
            points.add(new ReferencePoint(countSum / n, t.knownC(), n, spread, t.toString()));
        }
        return points;
    }

    /** Fits the model to the points and builds the new profile from the base (band, NETD, emissivity kept). */
    public static CalibrationResult fit(Profile base, List<ReferencePoint> points, CalibrationModel model, String name) {
        requireLinear(base);
        if (points.size() < model.minPoints())
            throw new InputRejected(null, "the " + model + " fit needs " + model.minPoints() + " or more reference"
                    + " targets, got " + points.size());
        int n = points.size();
        double[] count = new double[n], unit = new double[n];
        double lowC = Double.POSITIVE_INFINITY, highC = Double.NEGATIVE_INFINITY;
        Set<Double> distinctKnown = new HashSet<>();
        for (int i = 0; i < n; i++) {
            count[i] = points.get(i).signal();
            unit[i] = inUnit(base, points.get(i).knownC());
            lowC = Math.min(lowC, points.get(i).knownC());
            highC = Math.max(highC, points.get(i).knownC());
            distinctKnown.add(points.get(i).knownC());
        }
        if (distinctKnown.size() < model.minPoints())
            throw new InputRejected(null, "the " + model + " fit needs targets at " + model.minPoints()
                    + " or more different known temperatures, got " + distinctKnown.size());
        double gain, offset;
        SakumaHattori curve = null;
        double linearisationK = 0;
        double[] modelC = new double[n];
        switch (model) {
            case OFFSET -> {
                gain = base.gain();
                double s = 0;
                for (int i = 0; i < n; i++) s += unit[i] - gain * count[i];
                offset = s / n;
            }
            case GAIN_OFFSET -> {
                double[] line = line(count, unit);
                gain = line[0];
                offset = line[1];
            }
            case SAKUMA_HATTORI -> {
                double[] kelvin = new double[n];
                for (int i = 0; i < n; i++) {
                    kelvin[i] = points.get(i).knownC() + Profile.KELVIN_AT_ZERO_CELSIUS;
                    if (!(count[i] > 0))
                        throw new InputRejected(null, "target " + points.get(i).label() + " reads " + count[i]
                                + " counts; the Sakuma-Hattori fit needs positive signals");
                }
                curve = SakumaHattori.fit(kelvin, count, base.bandUm());
                for (int i = 0; i < n; i++) modelC[i] = curveCelsius(curve, count[i], points.get(i));
                // linearise over the calibrated signal range
                double lo = Double.POSITIVE_INFINITY, hi = Double.NEGATIVE_INFINITY;
                for (double c : count) {
                    lo = Math.min(lo, c);
                    hi = Math.max(hi, c);
                }
                double[] xs = new double[LINEARISATION_SAMPLES], ys = new double[LINEARISATION_SAMPLES];
                for (int k = 0; k < xs.length; k++) {
                    xs[k] = lo + (hi - lo) * k / (xs.length - 1);
                    ys[k] = inUnit(base, curve.kelvin(xs[k]) - Profile.KELVIN_AT_ZERO_CELSIUS);
                }
                double[] line = line(xs, ys);
                gain = line[0];
                offset = line[1];
                for (int k = 0; k < xs.length; k++)
                    linearisationK = Math.max(linearisationK, Math.abs(gain * xs[k] + offset - ys[k]));
            }
            default -> throw new IllegalStateException(model.toString());
        }
        if (!(gain > 0) || !Double.isFinite(offset))
            throw new InputRejected(null, String.format(Locale.ROOT, "the fitted gain is %.6g: the warmer targets"
                    + " do not read higher", gain), "check that each target's region and known temperature belong together");
        Profile profile = new Profile(name, description(base, model, n, lowC, highC), "linear", gain, offset,
                base.unit(), base.spanC(), base.netdK(), base.bandUm(), base.defaultEmissivity());
        double[] residual = new double[n], profileResidual = new double[n];
        for (int i = 0; i < n; i++) {
            double known = points.get(i).knownC();
            double profileC = profile.countToCelsius(count[i]);
            if (model != CalibrationModel.SAKUMA_HATTORI) modelC[i] = profileC;
            residual[i] = modelC[i] - known;
            profileResidual[i] = profileC - known;
        }
        String desc = profile.description() + String.format(Locale.ROOT, "; residuals up to %.3f K",
                maxAbs(profileResidual));
        if (curve != null)
            desc += String.format(Locale.ROOT, "; linearisation error up to %.3f K; curve in %s.sakuma-hattori.json",
                    linearisationK, name);
        profile = new Profile(profile.name(), desc, profile.encoding(), profile.gain(), profile.offset(),
                profile.unit(), profile.spanC(), profile.netdK(), profile.bandUm(), profile.defaultEmissivity());
        List<String> notes = new ArrayList<>();
        for (ReferencePoint p : points)
            if (p.spreadK() > 3 * base.netdK())
                notes.add(String.format(Locale.ROOT, "target %s is not uniform (spread %.2f K over its pixels):"
                        + " check its region", p.label(), p.spreadK()));
        // a camera's response drifts by per cent, not by factors: a gain far from the base profile's means regions
        // and known temperatures that do not belong together (two targets 0.14 K apart by their counts, given as
        // 30 and 60 degC, gave 213 times the base gain and an exact fit)
        double gainRatio = gain / base.gain();
        if (base.gain() > 0 && (gainRatio > GAIN_RATIO_LIMIT || gainRatio < 1 / GAIN_RATIO_LIMIT))
            notes.add(String.format(Locale.ROOT, "the fitted gain is %.3g times the base profile's (%s): the targets'"
                    + " counts differ by %.3g K on the base profile where their known temperatures differ by %.3g K;"
                    + " check each target's region and value", gainRatio, base.name(),
                    base.gain() * (max(count) - min(count)), highC - lowC));
        if (n == 2 && model == CalibrationModel.GAIN_OFFSET)
            notes.add("two targets determine gain and offset exactly: the residuals cannot show an error (add a third"
                    + " target to check the fit)");
        if (maxAbs(profileResidual) > 3 * base.netdK())
            notes.add(String.format(Locale.ROOT, "residuals up to %.2f K exceed 3 x NETD (%.2f K): check the target"
                    + " regions and known values, or try another model", maxAbs(profileResidual), 3 * base.netdK()));
        if (curve != null && linearisationK > base.netdK())
            notes.add(String.format(Locale.ROOT, "the profile's straight line departs from the fitted curve by up to"
                    + " %.2f K over the calibrated range (a profile holds only gain and offset): calibrate over a"
                    + " narrower range, or apply the curve file", linearisationK));
        if (curve != null) {
            double[] band = base.bandUm() == null ? BandRadiance.DEFAULT_BAND_UM : base.bandUm();
            if (curve.aUm() < band[0] / 2 || curve.aUm() > band[1] * 2)
                notes.add(String.format(Locale.ROOT, "the curve's effective wavelength A = %.4g um is far outside the"
                        + " %.4g-%.4g um band: the counts are not proportional to radiance (perhaps already linear in"
                        + " temperature); gain-offset is the better model", curve.aUm(), band[0], band[1]));
        }
        return new CalibrationResult(profile, model, List.copyOf(points), modelC, residual, profileResidual, curve,
                linearisationK, new double[]{lowC, highC}, List.copyOf(notes));
    }

    /** A fitted gain beyond this factor of the base profile's (either way) is flagged. */
    static final double GAIN_RATIO_LIMIT = 2.0;

    private static double max(double[] v) {
        double m = Double.NEGATIVE_INFINITY;
        for (double x : v) m = Math.max(m, x);
        return m;
    }

    private static double min(double[] v) {
        double m = Double.POSITIVE_INFINITY;
        for (double x : v) m = Math.min(m, x);
        return m;
    }

    private static double curveCelsius(SakumaHattori curve, double count, ReferencePoint p) {
        try {
            return curve.kelvin(count) - Profile.KELVIN_AT_ZERO_CELSIUS;
        } catch (IllegalArgumentException e) {
            throw new InputRejected(null, "the Sakuma-Hattori fit does not cover target " + p.label(),
                    "try --model gain-offset");
        }
    }

    private static String description(Profile base, CalibrationModel model, int n, double lowC, double highC) {
        return String.format(Locale.ROOT, "%s fit of profile %s to %d reference target%s from %.2f to %.2f C",
                model, base.name(), n, n == 1 ? "" : "s", lowC, highC);
    }

    /** Least-squares line y = a x + b: {a, b}. */
    private static double[] line(double[] x, double[] y) {
        double mx = 0, my = 0;
        for (int i = 0; i < x.length; i++) {
            mx += x[i] / x.length;
            my += y[i] / x.length;
        }
        double sxy = 0, sxx = 0;
        for (int i = 0; i < x.length; i++) {
            sxy += (x[i] - mx) * (y[i] - my);
            sxx += (x[i] - mx) * (x[i] - mx);
        }
        if (!(sxx > 0))
            throw new InputRejected(null, "every target reads the same count: a gain cannot be fitted",
                    "use targets at different temperatures, or --model offset");
        double a = sxy / sxx;
        return new double[]{a, my - a * mx};
    }

    private static double inUnit(Profile p, double celsius) {
        return p.kelvin() ? celsius + Profile.KELVIN_AT_ZERO_CELSIUS : celsius;
    }

    private static double maxAbs(double[] v) {
        double m = 0;
        for (double x : v) m = Math.max(m, Math.abs(x));
        return m;
    }

    private static void requireLinear(Profile base) {
        if (!"linear".equalsIgnoreCase(base.encoding()))
            throw new InputRejected(null, "calibrate fits the gain and offset of a linear (count) profile; profile '"
                    + base.name() + "' has encoding " + base.encoding(),
                    "read the reference frames with a linear profile such as u16-centikelvin (--profile)");
    }
}
