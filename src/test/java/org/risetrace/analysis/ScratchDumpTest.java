package org.risetrace.analysis;

import org.junit.jupiter.api.Test;
import java.nio.file.*;
import java.util.*;

class ScratchDumpTest {
    @Test
    void dump() throws Exception {
        for (String name : List.of("phase-short", "cap-short")) {
            Analysis a = SimulatedSeriesTest.analyze(Path.of("sample-frames", name));
            StringBuilder sb = new StringBuilder();
            for (RiseCurve c : a.curves()) {
                sb.append(c.ref());
                for (int i = 0; i < c.tS().length; i++) sb.append(' ').append(c.tS()[i]).append(':').append(c.riseK()[i]);
                sb.append('\n');
            }
            Files.writeString(Path.of("/tmp/fit2-curves-" + name + ".txt"), sb.toString());
        }
    }
}
