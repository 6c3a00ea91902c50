package org.risetrace.planning;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.frame.InputRejected;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** readings.csv: read once, every problem refused naming the file, line and field. */
class ReadingsFileTest {
    @TempDir
    Path dir;

    Path csv(String text) throws Exception {
        Path p = dir.resolve("readings.csv");
        Files.writeString(p, text, StandardCharsets.UTF_8);
        return p;
    }

    void rejected(String text, String... parts) throws Exception {
        Path p = csv(text);
        InputRejected e = assertThrows(InputRejected.class, () -> ReadingsFile.read(p));
        assertTrue(e.getMessage().startsWith(p.toString()), e.getMessage());
        for (String s : parts) assertTrue(e.getMessage().contains(s), "'" + s + "' in: " + e.getMessage());
        assertEquals(1, e.getMessage().lines().count());
    }

    @Test
    void readsColumnsInAnyOrderWithQuotesCommentsAndBlankLines() throws Exception {
        Path p = csv("\uFEFF# phase check before injection\nunit,value,where,what,instrument,frequency_hz,inductance_uh,notes\n"
                + "ohm,0.15,L1,phase inductor,\"ESR meter, 100 kHz\",100000,0.22,\n\n"
                + "ohm,0.004,L4,phase inductor,ESR meter,1e5,0.22,\"warm, \"\"cracked\"\"\"\n"
                + "V,0.0,VCORE,rail voltage,,,,\n");
        List<BenchReading> r = ReadingsFile.read(p);
        assertEquals(3, r.size());
        assertEquals("ESR meter, 100 kHz", r.get(0).instrument());
        assertEquals(3, r.get(0).line());
        assertEquals(5, r.get(1).line());
        assertEquals(100000.0, r.get(1).frequencyHz());
        assertEquals("warm, \"cracked\"", r.get(1).notes());
        assertNull(r.get(2).frequencyHz());
        assertEquals("0.004", r.get(1).valueText());
    }

    @Test
    void refusesEachKindOfBadInput() throws Exception {
        rejected("what,where,value,unit,colour\n", "line 1", "unknown column 'colour'");
        rejected("what,where,value\nx,y,1\n", "line 1", "no column 'unit'");
        rejected("what,where,value,unit,unit\n", "appears twice");
        rejected("what,where,value,unit\nphase inductor,L1,0,15,ohm\n", "line 2", "5 fields");
        rejected("what,where,value,unit\nphase inductor,L1,0;15,ohm\n", "line 2", "field 'value'", "not a number");
        rejected("what,where,value,unit\nphase inductor,L1,0.15,\n", "line 2", "field 'unit'", "empty");
        rejected("what,where,value,unit\n,L1,0.15,ohm\n", "line 2", "field 'what'");
        rejected("what,where,value,unit,frequency_hz\n# c\nphase inductor,L1,0.15,ohm,-5\n", "line 3",
                "field 'frequency_hz'", "above 0");
        rejected("what,where,value,unit,inductance_uh\nphase inductor,L1,0.15,ohm,0.22\n", "line 2",
                "field 'frequency_hz'", "test frequency");
        rejected("what,where,value,unit\n", "no readings");
        rejected("", "empty");
        rejected("what,where,value,unit\nphase inductor,L1,NaN,ohm\n", "line 2", "not a number");
        Path missing = dir.resolve("none.csv");
        InputRejected e = assertThrows(InputRejected.class, () -> ReadingsFile.read(missing));
        assertTrue(e.getMessage().contains("not found"));
        Path latin = dir.resolve("latin.csv");
        Files.write(latin, "what,where,value,unit\nx,y,1,\u00b5H\n".getBytes(StandardCharsets.ISO_8859_1));
        e = assertThrows(InputRejected.class, () -> ReadingsFile.read(latin));
        assertTrue(e.getMessage().contains("not UTF-8"), e.getMessage());
    }
}
