package org.risetrace.fuzz;

import com.code_intelligence.jazzer.junit.FuzzTest;

/** Calibration profiles. Seeds: ProfileFuzzTestInputs/profiles. */
class ProfileFuzzTest {
    @FuzzTest(maxDuration = "10s")
    void profiles(byte[] data) {
        FuzzChecks.profile(data);
    }
}
