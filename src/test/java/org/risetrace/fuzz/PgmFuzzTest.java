package org.risetrace.fuzz;

import com.code_intelligence.jazzer.junit.FuzzTest;

/** PGM frames (netpbm). Seeds: PgmFuzzTestInputs/pgmFrames. */
class PgmFuzzTest {
    @FuzzTest(maxDuration = "10s")
    void pgmFrames(byte[] data) {
        FuzzChecks.frame("f.pgm", data);
    }
}
