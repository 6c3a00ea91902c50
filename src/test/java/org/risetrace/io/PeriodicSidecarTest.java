package org.risetrace.io;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.frame.InputRejected;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The periodic-injection fields of series.json (README, "Lock-in analysis"): read, and refused naming the field. */
class PeriodicSidecarTest {
    @TempDir
    Path dir;

    private Sidecar load(String injection) throws IOException {
        Path f = dir.resolve("series.json");
        Files.writeString(f, "{\"injection\": " + injection + "}");
        return Sidecars.load(f);
    }

    @Test
    void periodAndOnTimeAreReadAndMakeTheInjectionPeriodic() throws IOException {
        Sidecar s = load("{\"start_s\": 2.0, \"period_s\": 8.0, \"on_s\": 3.0}");
        assertTrue(s.injection().periodic());
        assertEquals(8.0, s.injection().periodS());
        assertEquals(3.0, s.injection().onS());
        assertFalse(load("{\"start_s\": 2.0}").injection().periodic());
    }

    @Test
    void switchingTimesMakeTheInjectionPeriodicAndMustRise() throws IOException {
        assertTrue(load("{\"switch_s\": [2, 6, 10, 14]}").injection().periodic());
        InputRejected e = assertThrows(InputRejected.class, () -> load("{\"switch_s\": [2, 6, 5, 14]}"));
        assertTrue(e.getMessage().contains("injection.switch_s"), e.getMessage());
        e = assertThrows(InputRejected.class, () -> load("{\"switch_s\": [2, 6]}"));
        assertTrue(e.getMessage().contains("two on/off pairs"), e.getMessage());
        e = assertThrows(InputRejected.class, () -> load("{\"period_s\": 8, \"switch_s\": [2, 6, 10, 14]}"));
        assertTrue(e.getMessage().contains("not both"), e.getMessage());
    }

    @Test
    void badPeriodicFieldsAreRefusedNamingTheField() {
        InputRejected e = assertThrows(InputRejected.class, () -> load("{\"period_s\": -1}"));
        assertTrue(e.getMessage().contains("injection.period_s"), e.getMessage());
        e = assertThrows(InputRejected.class, () -> load("{\"on_s\": 2}"));
        assertTrue(e.getMessage().contains("injection.on_s"), e.getMessage());
        e = assertThrows(InputRejected.class, () -> load("{\"period_s\": 4, \"on_s\": 4}"));
        assertTrue(e.getMessage().contains("injection.on_s"), e.getMessage());
    }
}
