package org.risetrace.analysis;

/**
 * Which frames are the baseline, which are the "last frames", and when heating starts, decided from the frame
 * times before any frame is decoded: frames before the sidecar's injection start; else the first N frames (option);
 * else the first frame. Without an injection start, heating is taken to start at the last baseline frame.
 *
 * @param baseline  per frame index: a baseline frame
 * @param last      per frame index: one of the last frames (never a baseline frame)
 * @param tStartS   injection start in series seconds
 * @param rule      the rule applied, in words
 */
public record BaselinePlan(boolean[] baseline, boolean[] last, double tStartS, String rule) {

    public static BaselinePlan plan(double[] tS, Double injectionStartS, Integer baselineFrames, int lastFrames) {
        int n = tS.length;
        boolean[] base = new boolean[n], last = new boolean[n];
        double tStart;
        String rule;
        int before = 0;
        if (injectionStartS != null) for (double t : tS) if (t < injectionStartS) before++;
        if (injectionStartS != null && before > 0) {
            for (int i = 0; i < n; i++) base[i] = tS[i] < injectionStartS;
            tStart = injectionStartS;
            rule = before + (before == 1 ? " frame" : " frames") + " before the injection start at " + injectionStartS + " s";
        } else {
            int b = Math.min(n, baselineFrames != null ? baselineFrames : 1);
            for (int i = 0; i < b; i++) base[i] = true;
            tStart = injectionStartS != null ? injectionStartS : (b > 0 ? tS[b - 1] : 0);
            rule = baselineFrames != null ? (b == 1 ? "the first frame (option)" : "the first " + b + " frames (option)")
                    : "the first frame";
        }
        int marked = 0;
        for (int i = n - 1; i >= 0 && marked < lastFrames; i--)
            if (!base[i]) {
                last[i] = true;
                marked++;
            }
        return new BaselinePlan(base, last, tStart, rule);
    }
}
