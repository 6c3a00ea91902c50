package org.risetrace.planning;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.frame.InputRejected;
import org.risetrace.io.Sidecar;
import org.risetrace.io.Sidecars;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The plan in series.json: written without losing anything else, backed up, read back checked. */
class SeriesInjectionTest {
    @TempDir
    Path dir;

    static InjectionPlan plan() {
        return Planner.plan(new PlanRequest(Topology.ACROSS_SWITCH, "VCORE", 1.0, "VIN", 12.0, 0.05, 0.002, 30, 3,
                null, null, null, false, false, null, null, null));
    }

    @Test
    void writesTheInjectionRecordAndKeepsEverythingElse() throws Exception {
        String old = """
                {
                  "profile": "u16-centikelvin",
                  "frame_interval_s": 0.5,
                  "injection": {"start_s": 5.0, "supply": "bench supply", "notes": "board DB-9 rev B", "volts": 0.8},
                  "frames": {"f1.png": {"t_s": 0.0}},
                  "notes": "camera 30 cm above"
                }
                """;
        Files.writeString(dir.resolve("series.json"), old);
        InjectionPlan p = plan();
        Path file = SeriesInjection.write(dir, p);
        Sidecar s = Sidecars.load(file);
        assertEquals("u16-centikelvin", s.profile());
        assertEquals(0.5, s.frameIntervalS());
        assertEquals(0.0, s.frames().get("f1.png").tS());
        assertEquals("camera 30 cm above", s.notes());
        Sidecar.Injection inj = s.injection();
        assertEquals(5.0, inj.startS());
        assertEquals("bench supply", inj.supply());
        assertEquals("board DB-9 rev B", inj.notes());
        assertEquals("VIN", inj.fromRail());
        assertEquals("VCORE", inj.toRail());
        assertEquals(12.0, inj.volts());
        assertEquals(3.0, inj.currentLimitA());
        assertEquals(p, SeriesInjection.planOf(inj, file));
        // the old file is kept byte for byte; no temporary file is left; the field order is the old one
        assertEquals(old, Files.readString(dir.resolve(SeriesInjection.BACKUP_FILE)));
        try (Stream<Path> files = Files.list(dir)) {
            assertEquals(List.of("series.json", "series.previous.json"), files.map(f -> f.getFileName().toString()).sorted().toList());
        }
        JsonNode tree = new ObjectMapper().readTree(file.toFile());
        assertEquals(List.of("profile", "frame_interval_s", "injection", "frames", "notes"),
                iterable(tree.fieldNames()));
    }

    private static List<String> iterable(java.util.Iterator<String> it) {
        List<String> l = new java.util.ArrayList<>();
        it.forEachRemaining(l::add);
        return l;
    }

    @Test
    void createsSeriesJsonWhenThereIsNone() {
        Path file = SeriesInjection.write(dir, plan());
        assertEquals("VIN", Sidecars.load(file).injection().fromRail());
        assertFalse(Files.exists(dir.resolve(SeriesInjection.BACKUP_FILE)));
    }

    @Test
    void brokenSeriesJsonIsRefusedAndLeftAlone() throws Exception {
        String broken = "{\"profile\": \"u16-centikelvin\", \"frame_interval\": 1}";
        Files.writeString(dir.resolve("series.json"), broken);
        InputRejected e = assertThrows(InputRejected.class, () -> SeriesInjection.write(dir, plan()));
        assertTrue(e.getMessage().contains("frame_interval"), e.getMessage());
        assertEquals(broken, Files.readString(dir.resolve("series.json")));
        assertFalse(Files.exists(dir.resolve(SeriesInjection.BACKUP_FILE)));
    }

    @Test
    void aPlanThatCannotBeReadIsRefusedNamingTheField() throws Exception {
        Files.writeString(dir.resolve("series.json"), "{\"injection\": {\"plan\": {\"schema\": \"risetrace-plan/1\", "
                + "\"inputs\": {\"topology\": \"rail-to-ground\", \"rail_nominal_v\": 1.0, \"measured_ohms\": -2, "
                + "\"supply_max_v\": 5, \"supply_max_a\": 1, \"battery_connected\": false, \"mains_connected\": false}}}}");
        Sidecar s = Sidecars.load(dir.resolve("series.json"));
        InputRejected e = assertThrows(InputRejected.class, () -> SeriesInjection.planOf(s.injection(), dir.resolve("series.json")));
        assertTrue(e.getMessage().contains("series.json"), e.getMessage());
        assertTrue(e.getMessage().contains("injection.plan.inputs"), e.getMessage());
        assertTrue(e.getMessage().contains("measured resistance"), e.getMessage());
        Files.writeString(dir.resolve("series.json"), "{\"injection\": {\"plan\": 3}}");
        e = assertThrows(InputRejected.class, () -> Sidecars.load(dir.resolve("series.json")));
        assertTrue(e.getMessage().contains("injection.plan"), e.getMessage());
    }
}
