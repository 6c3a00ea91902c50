package org.risetrace.analysis;

/**
 * A lock-in analysis and the steady analysis of the same frames (one pass over the series feeds both).
 *
 * @param steady        the steady analysis (rates, rise map), as for a step injection
 * @param result        the lock-in section of analysis.json
 * @param amplitudeMap  per board pixel amplitude at the fundamental, apparent kelvin
 * @param lagMap        per board pixel lag behind the excitation, degrees; NaN where the amplitude is under the hot spot
 *                      threshold (5) in standard errors
 */
public record LockIn(Analysis steady, LockInResult result, BoardMap amplitudeMap, BoardMap lagMap) {
}
