package org.risetrace.frame;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Reading an input file whole: the bytes as written, the limit kept, the stated size only a hint. */
class InputFilesTest {
    @TempDir
    Path dir;

    @Test
    void readsEveryByteOfFilesOfManySizes() throws Exception {
        Random r = new Random(3);
        for (int size : new int[]{0, 1, 8191, 8192, 8193, 655_360, 1_000_003}) {
            byte[] data = new byte[size];
            r.nextBytes(data);
            Path f = dir.resolve("f" + size + ".bin");
            Files.write(f, data);
            assertArrayEquals(data, InputFiles.read(f, "frame", 2_000_000), "size " + size);
            // exactly at the limit is allowed, one byte over is refused with the file named
            assertArrayEquals(data, InputFiles.read(f, "frame", size), "size " + size + " at the limit");
            if (size > 0) {
                InputRejected e = assertThrows(InputRejected.class, () -> InputFiles.read(f, "frame", size - 1));
                assertTrue(e.getMessage().contains(f.getFileName().toString()) && e.getMessage().contains("larger than"),
                        e.getMessage());
            }
        }
    }

    @Test
    void aFileWhoseStatedSizeIsZeroIsStillReadToItsEnd() throws Exception {
        // Linux: files under /proc state size 0 and hold text (common practice); elsewhere the test has nothing to read
        Path status = Path.of("/proc/self/status");
        if (!Files.isReadable(status)) return;
        assertEquals(0, Files.size(status), "premise: /proc states size 0");
        byte[] b = InputFiles.read(status, "status file", 1 << 20);
        assertTrue(b.length > 0 && new String(b, java.nio.charset.StandardCharsets.US_ASCII).contains("Name:"));
        assertThrows(InputRejected.class, () -> InputFiles.read(status, "status file", 10));
    }
}
