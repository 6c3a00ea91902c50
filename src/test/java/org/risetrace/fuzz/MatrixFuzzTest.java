package org.risetrace.fuzz;

import com.code_intelligence.jazzer.junit.FuzzTest;

/** CSV/TSV text matrices. Seeds: MatrixFuzzTestInputs/matrixFrames. */
class MatrixFuzzTest {
    @FuzzTest(maxDuration = "10s")
    void matrixFrames(byte[] data) {
        FuzzChecks.frame("f.csv", data);
    }
}
