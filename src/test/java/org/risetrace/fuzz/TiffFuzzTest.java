package org.risetrace.fuzz;

import com.code_intelligence.jazzer.junit.FuzzTest;

/** TIFF frames (own strip reader, predictor paths, the JDK plug-in). Seeds: TiffFuzzTestInputs/tiffFrames. */
class TiffFuzzTest {
    @FuzzTest(maxDuration = "10s")
    void tiffFrames(byte[] data) {
        FuzzChecks.frame("f.tif", data);
    }
}
