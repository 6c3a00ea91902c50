package org.risetrace.calibration;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.frame.InputRejected;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Bundled calibration profiles and profile lookup. */
class ProfilesTest {
    @TempDir
    Path dir;

    @Test
    void everyBundledProfileLoadsAndIsValid() {
        for (String name : Profiles.BUNDLED) {
            Profile p = Profiles.load(name);
            assertEquals(name, p.name());
            assertTrue(p.netdK() > 0 && p.bandUm()[1] > p.bandUm()[0]);
        }
    }

    @Test
    void centikelvinZeroCelsiusIs27315Counts() {
        Profile p = Profiles.load("u16-centikelvin");
        // SI: T(degC) = T(K) - 273.15, so 0 degC = 27315 counts of 0.01 K
        assertEquals(0.0, p.countToCelsius(27315), 1e-9);
        assertEquals(27315.0, p.celsiusToCount(0.0), 1e-9);
        assertEquals(100.0, p.countToCelsius(37315), 1e-9);
        assertEquals(-273.15, p.countToCelsius(0), 1e-9); // 0 counts = 0 K, absolute zero
    }

    @Test
    void decikelvinZeroCelsiusIs2731Point5Counts() {
        Profile p = Profiles.load("u16-decikelvin");
        assertEquals(0.0, p.countToCelsius(2731.5), 1e-9); // SI: 273.15 K = 0 degC, 0.1 K per count
        assertEquals(26.85, p.countToCelsius(3000), 1e-9);
    }

    @Test
    void profileByPathResolvesAgainstTheBaseFolder() throws IOException {
        Files.writeString(dir.resolve("cam.json"), """
                {"name": "cam", "encoding": "linear", "gain": 0.04, "offset": -100, "unit": "C",
                 "netd_k": 0.03, "band_um": [8, 14], "default_emissivity": 0.9}""");
        Profile p = Profiles.load("cam.json", dir);
        assertEquals(-100 + 0.04 * 3000, p.countToCelsius(3000), 1e-9);
    }

    @Test
    void unknownNameListsTheKnownProfiles() {
        InputRejected e = assertThrows(InputRejected.class, () -> Profiles.load("no-such-profile"));
        for (String name : Profiles.BUNDLED) assertTrue(e.getMessage().contains(name), e.getMessage());
    }

    @Test
    void unknownFieldIsRejectedWithLine() throws IOException {
        Path f = Files.writeString(dir.resolve("bad.json"), "{\n \"name\": \"bad\",\n \"gian\": 0.01\n}");
        InputRejected e = assertThrows(InputRejected.class, () -> Profiles.load(f.toString()));
        assertTrue(e.getMessage().contains("bad.json") && e.getMessage().contains("'gian'")
                && e.getMessage().contains("line 3, column 2"), e.getMessage());
    }

    @Test
    void linearProfileWithoutGainIsRejected() throws IOException {
        Path f = Files.writeString(dir.resolve("nogain.json"), """
                {"name": "nogain", "encoding": "linear", "offset": 0, "unit": "K", "netd_k": 0.05,
                 "band_um": [7.5, 14], "default_emissivity": 0.95}""");
        InputRejected e = assertThrows(InputRejected.class, () -> Profiles.load(f.toString()));
        assertTrue(e.getMessage().contains("gain"), e.getMessage());
    }

    @Test
    void knownProfilesLeaveOutTheMaterialsTable() {
        // the tests run in the repository root, whose calibration/ holds materials.json beside the profiles
        assertTrue(Files.isRegularFile(Path.of("calibration", "materials.json")));
        assertTrue(Profiles.known().contains("u16-centikelvin"));
        assertTrue(!Profiles.known().contains("materials"), Profiles.known().toString());
    }
}
