package org.risetrace.fuzz;

import com.code_intelligence.jazzer.junit.FuzzTest;

/** series.json. Seeds: SidecarFuzzTestInputs/sidecars. */
class SidecarFuzzTest {
    @FuzzTest(maxDuration = "10s")
    void sidecars(byte[] data) {
        FuzzChecks.sidecar(data);
    }
}
