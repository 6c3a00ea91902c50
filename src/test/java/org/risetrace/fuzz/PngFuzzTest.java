package org.risetrace.fuzz;

import com.code_intelligence.jazzer.junit.FuzzTest;

/** PNG frames (direct grey decoder and the JDK plug-in). Seeds: PngFuzzTestInputs/pngFrames. */
class PngFuzzTest {
    @FuzzTest(maxDuration = "10s")
    void pngFrames(byte[] data) {
        FuzzChecks.frame("f.png", data);
    }
}
