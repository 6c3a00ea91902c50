package org.risetrace.fuzz;

import com.code_intelligence.jazzer.junit.FuzzTest;

/** JPEG and BMP frames (the reader is picked by the magic bytes). Seeds: JpegBmpFuzzTestInputs/jpegBmpFrames. */
class JpegBmpFuzzTest {
    @FuzzTest(maxDuration = "10s")
    void jpegBmpFrames(byte[] data) {
        FuzzChecks.frame(data.length > 0 && data[0] == 'B' ? "f.bmp" : "f.jpg", data);
    }
}
