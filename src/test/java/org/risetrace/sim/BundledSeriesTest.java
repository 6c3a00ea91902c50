package org.risetrace.sim;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.risetrace.board.Board;
import org.risetrace.cli.Main;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The bundled demo series in sample-frames/ are what their scenario files make, byte for byte. */
class BundledSeriesTest {
    static final Path SAMPLES = Path.of("sample-frames");

    @TempDir
    Path dir;

    /** The smaller series are regenerated in the test (phase-short takes longer and uses the same code paths). */
    @ParameterizedTest
    @ValueSource(strings = {"before-after", "cap-short", "leak-pulse"})
    void simulateCommandRegeneratesBundledSeriesByteForByte(String name) throws IOException {
        Path out = dir.resolve(name);
        int code = Main.run("simulate", "--scenario", SAMPLES.resolve(name).resolve("scenario.json").toString(),
                "--out", out.toString());
        assertEquals(Main.EXIT_OK, code);
        Map<String, String> committed = SimulatorTest.hashes(SAMPLES.resolve(name));
        committed.remove("scenario.json");
        committed.keySet().removeIf(f -> f.endsWith(".md"));
        assertEquals(committed, SimulatorTest.hashes(out));
    }

    @Test
    void capShortLeavesTheShortedCapacitorOutOfTheBoardFile() throws IOException {
        Board board = Scenario.JSON.readValue(SAMPLES.resolve("cap-short/board.json").toFile(), Board.class);
        Truth truth = Truth.read(SAMPLES.resolve("cap-short/truth.json"));
        assertEquals("C17", truth.primarySource());
        assertFalse(board.parts().stream().anyMatch(p -> p.ref().equals("C17")));
        assertTrue(truth.unmarked().stream().anyMatch(u -> u.ref().equals("C17")));
    }

    /** phase-short: the shorted switch is ahead of its neighbours, but only by a few kelvin (fact of the trade: common practice). */
    @Test
    void phaseShortSourceIsModestlyAheadOfItsNeighbours() {
        Truth truth = Truth.read(SAMPLES.resolve("phase-short/truth.json"));
        assertEquals("Q3", truth.primarySource());
        double[] q3 = truth.part("Q3");
        int last = q3.length - 1;
        double lead = q3[last] - q3[0];
        for (String other : new String[]{"Q1", "Q2", "Q4", "Q5", "Q6", "L2"}) {
            double[] o = truth.part(other);
            double gap = lead - (o[last] - o[0]);
            assertTrue(gap > 1.0 && gap < 4.0, other + " gap " + gap);
        }
        assertEquals(90, truth.frames().size());
    }
}
