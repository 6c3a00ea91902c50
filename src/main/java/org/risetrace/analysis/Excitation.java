package org.risetrace.analysis;

import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;

/**
 * The timing of a periodic (lock-in) injection: switched on at {@code firstOnS} and every {@code periodS} after it,
 * on for {@code onS} of each period.
 *
 * <p>The reference is the excitation's fundamental: an on/off wave of period T that is on for t_on has its
 * fundamental cos(theta), theta = omega (t - t_first_on) - pi t_on / T (its peak lies in the middle of the on
 * interval). A response A cos(theta - phi) has in-phase part A cos phi, quadrature part A sin phi, and
 * phi is its lag behind the excitation (lock-in thermography's 0 and -90 degree signals; Breitenstein, Warta and
 * Langenkamp, Lock-in Thermography, Springer, chapter 2).
 *
 * @param periodS   seconds from one switch-on to the next
 * @param onS       seconds on in each period
 * @param firstOnS  series time of the first switch-on
 * @param source    where the timing came from, in plain words
 */
@JsonPropertyOrder({"period_s", "on_s", "first_on_s", "frequency_hz", "source"})
public record Excitation(@JsonProperty("period_s") double periodS, @JsonProperty("on_s") double onS,
                         @JsonProperty("first_on_s") double firstOnS, @JsonProperty("source") String source) {

    public Excitation {
        if (!(periodS > 0) || !Double.isFinite(periodS)) throw new IllegalArgumentException("period must be positive");
        if (!(onS > 0 && onS < periodS)) throw new IllegalArgumentException("on time must lie within the period");
        if (!Double.isFinite(firstOnS)) throw new IllegalArgumentException("first switch-on must be finite");
    }

    @JsonProperty("frequency_hz")
    public double frequencyHz() {
        return 1.0 / periodS;
    }

    public double omega() {
        return 2 * Math.PI / periodS;
    }

    /** Phase of the excitation's fundamental at series time t, radians. */
    public double referencePhase(double tS) {
        return omega() * (tS - firstOnS) - Math.PI * onS / periodS;
    }

    /**
     * The analysis window: the whole periods from the first switch-on at or after the first frame up to the last
     * frame. A frame stands for the time up to the next one, so the last frame counts until one typical frame
     * spacing (the median) after it.
     *
     * @return the window, or one with zero periods when the frames span less than one period
     */
    public Window window(double[] tS) {
        if (tS.length == 0) return new Window(firstOnS, 0, periodS);
        double first = tS[0], last = tS[tS.length - 1];
        double[] gaps = new double[Math.max(0, tS.length - 1)];
        for (int i = 1; i < tS.length; i++) gaps[i - 1] = tS[i] - tS[i - 1];
        java.util.Arrays.sort(gaps);
        double spacing = gaps.length == 0 ? 0 : gaps[gaps.length / 2];
        double k0 = Math.ceil((first - firstOnS) / periodS - 1e-9);
        double start = firstOnS + Math.max(0, k0) * periodS;
        int periods = (int) Math.floor((last + spacing - start) / periodS + 1e-9);
        return new Window(start, Math.max(0, periods), periodS);
    }

    /** Whole periods [startS, startS + periods * period). */
    public record Window(double startS, int periods, double periodS) {
        public double endS() {
            return startS + periods * periodS;
        }

        public boolean contains(double tS) {
            return tS >= startS - 1e-9 && tS < endS() - 1e-9;
        }
    }
}
