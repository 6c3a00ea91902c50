package org.risetrace.fuzz;

import com.code_intelligence.jazzer.junit.FuzzTest;

/** board.json. Seeds: BoardFileFuzzTestInputs/boardFiles. */
class BoardFileFuzzTest {
    @FuzzTest(maxDuration = "10s")
    void boardFiles(byte[] data) {
        FuzzChecks.board(data);
    }
}
