package org.risetrace.fuzz;

import com.code_intelligence.jazzer.junit.FuzzTest;

/** Placement lists (CSV). Seeds: PlacementFuzzTestInputs/placements. */
class PlacementFuzzTest {
    @FuzzTest(maxDuration = "10s")
    void placements(byte[] data) {
        FuzzChecks.placement(data);
    }
}
