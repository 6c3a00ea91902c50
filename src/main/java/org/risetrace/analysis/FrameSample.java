package org.risetrace.analysis;

import org.risetrace.registration.BoardRaster;
import org.risetrace.registration.FrameRegistration;

/**
 * What the per-frame stage (decode, register, rectify, sample) hands to the in-order accumulator.
 *
 * @param index        frame index in the series
 * @param file         file name
 * @param tS           series time
 * @param sha256       hash of the file's bytes
 * @param registration the frame's registration (status failed: raster and stats are null)
 * @param raster       the frame in board space (null when failed)
 * @param stats        per part {@link FootprintSampler} statistics, apparent temperatures (null when failed)
 * @param ambientC     the frame's ambient (NaN when unknown)
 */
public record FrameSample(int index, String file, double tS, String sha256, FrameRegistration registration,
                          BoardRaster raster, double[] stats, double ambientC) {

    public boolean used() {
        return registration != null && registration.status().usable() && raster != null && stats != null;
    }
}
