package org.risetrace.calibration;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.frame.InputRejected;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

class MaterialsTest {
    @Test
    void bundledTableHoldsTheMaterialsOfABoard() {
        Materials m = Materials.load();
        for (String name : List.of("solder mask", "epoxy moulded package", "ceramic capacitor body", "oxidised copper",
                "bare copper", "tin-lead solder", "lead-free solder", "aluminium bare", "aluminium anodised",
                "painted sleeve", "polyimide tape", "black vinyl tape"))
            assertTrue(m.contains(name), name);
        for (Material x : m.materials()) assertTrue(m.contains(x.name()));
        for (String name : m.names()) {
            Material x = m.get(name);
            assertTrue(x.emissivity() > 0 && x.emissivity() <= 1, name);
            assertTrue(x.uncertainty() >= 0 && x.uncertainty() < 0.5, name);
            assertFalse(x.source().isBlank(), name);
        }
    }

    @Test
    void bareMetalsAreUnreliableAndTapesAreGoodTargets() {
        Materials m = Materials.load();
        // bright metals emit little in the long-wave band (common practice: they read the room)
        for (String metal : List.of("bare copper", "tin-lead solder", "lead-free solder", "aluminium bare"))
            assertTrue(m.get(metal).unreliable(), metal);
        // tapes and paints are used as emissivity targets because they are near 0.95 (common practice)
        for (String target : List.of("polyimide tape", "black vinyl tape", "painted sleeve", "solder mask"))
            assertTrue(m.get(target).emissivity() >= 0.85 && !m.get(target).unreliable(), target);
    }

    @Test
    void namesMatchIgnoringCaseAndSeparators() {
        Materials m = Materials.load();
        assertEquals("lead-free solder", m.get("Lead_Free  Solder").name());
        assertEquals("black vinyl tape", m.get("black-vinyl-tape").name());
        // short names in use on boards and in scenarios are aliases of the full entries, listed among the names
        assertEquals("epoxy moulded package", m.get("epoxy").name());
        assertEquals("ceramic capacitor body", m.get("ceramic").name());
        assertTrue(m.names().contains("epoxy") && m.names().contains("bare copper"));
    }

    @Test
    void unknownNameListsKnownNames() {
        InputRejected e = assertThrows(InputRejected.class, () -> Materials.load().get("unobtainium"));
        assertTrue(e.getMessage().contains("unobtainium") && e.getMessage().contains("bare copper"), e.getMessage());
    }

    @Test
    void userFileLoads(@TempDir Path dir) throws IOException {
        Path f = dir.resolve("mine.json");
        Files.writeString(f, "[{\"name\": \"grey paint\", \"emissivity\": 0.94, \"uncertainty\": 0.02, \"source\": \"measured\"}]");
        Materials m = Materials.load(f);
        assertEquals(0.94, m.get("grey paint").emissivity(), 0.0);
        assertEquals(1, m.names().size());
    }

    @Test
    void badUserFilesAreRejectedNamingFileLineAndField(@TempDir Path dir) throws IOException {
        Path f = dir.resolve("bad.json");
        Files.writeString(f, "[\n {\"name\": \"a\", \"emissivity\": 0.9, \"uncertainty\": 0.02, \"source\": \"x\"},\n"
                + " {\"name\": \"b\", \"emissivity\": 1.4, \"uncertainty\": 0.02, \"source\": \"x\"}\n]");
        InputRejected e = assertThrows(InputRejected.class, () -> Materials.load(f));
        assertTrue(e.getMessage().startsWith(f.toString()) && e.getMessage().contains("line 3")
                && e.getMessage().contains("'emissivity'"), e.getMessage());

        Files.writeString(f, "[\n {\"name\": \"a\", \"emisivity\": 0.9, \"uncertainty\": 0.02, \"source\": \"x\"}\n]");
        e = assertThrows(InputRejected.class, () -> Materials.load(f));
        assertTrue(e.getMessage().contains("line 2") && e.getMessage().contains("'emisivity'"), e.getMessage());

        Files.writeString(f, "[\n {\"name\": \"a\", \"emissivity\": \"high\", \"uncertainty\": 0.02, \"source\": \"x\"}\n]");
        e = assertThrows(InputRejected.class, () -> Materials.load(f));
        assertTrue(e.getMessage().contains("line 2") && e.getMessage().contains("'emissivity'"), e.getMessage());

        Files.writeString(f, "[{\"name\": \"a\", \"emissivity\": 0.9, \"uncertainty\": 0.02, \"source\": \"x\"},"
                + "{\"name\": \"A\", \"emissivity\": 0.8, \"uncertainty\": 0.02, \"source\": \"y\"}]");
        e = assertThrows(InputRejected.class, () -> Materials.load(f));
        assertTrue(e.getMessage().contains("twice"), e.getMessage());

        Files.writeString(f, "[{\"name\": \"a\", \"aliases\": [\"b\"], \"emissivity\": 0.9, \"uncertainty\": 0.02, \"source\": \"x\"},"
                + "{\"name\": \"b\", \"emissivity\": 0.8, \"uncertainty\": 0.02, \"source\": \"y\"}]");
        e = assertThrows(InputRejected.class, () -> Materials.load(f));
        assertTrue(e.getMessage().contains("twice"), e.getMessage());

        Files.writeString(f, "{\"name\": \"a\"}");
        assertThrows(InputRejected.class, () -> Materials.load(f));
        Files.writeString(f, "[{\"name\": \"a\", \"emissivity\": 0.9, \"uncertainty\": 0.02}]");
        e = assertThrows(InputRejected.class, () -> Materials.load(f));
        assertTrue(e.getMessage().contains("source"), e.getMessage());
        assertThrows(InputRejected.class, () -> Materials.load(dir.resolve("missing.json")));
    }
}
