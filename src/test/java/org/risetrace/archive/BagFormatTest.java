package org.risetrace.archive;

import org.junit.jupiter.api.Test;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;

/** Manifest paths as RFC 8493 section 2.1.3 writes them, and the path check every bag path passes. */
class BagFormatTest {
    @Test
    void percentCrAndLfAreEncodedAndNothingElse() {
        // RFC 8493 2.1.3: "%" -> %25, CR -> %0D, LF -> %0A; other characters (spaces, UTF-8) stay as they are
        assertEquals("data/at 100%25 load.png", BagFormat.encodePath("data/at 100% load.png"));
        assertEquals("data/a%0Ab%0Dc", BagFormat.encodePath("data/a\nb\rc"));
        assertEquals("data/Bild \u00e4.png", BagFormat.encodePath("data/Bild \u00e4.png"));
        for (String p : new String[]{"data/at 100% load.png", "data/a\nb\rc", "data/%0A literally", "data/50%"})
            assertEquals(p, BagFormat.decodePath(BagFormat.encodePath(p)), p);
        assertEquals("data/x%41", BagFormat.decodePath("data/x%41"), "only the three codes are decoded");
        assertEquals("data/\n", BagFormat.decodePath("data/%0a"), "hex digits in either case");
    }

    @Test
    void pathsThatLeaveTheBagAreNamed() {
        assertNull(BagFormat.unsafe("data/series/s1/f0001.png"));
        assertNull(BagFormat.unsafe("C-7/data/"));
        for (String bad : new String[]{"", "/etc/passwd", "C:/x", "data\\x", "data/../../x", "../x", "data/./x",
                "data//x", "data/\u0001x"})
            assertNotNull(BagFormat.unsafe(bad), bad);
    }
}
