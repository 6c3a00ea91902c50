package org.risetrace.io;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.frame.InputRejected;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

/**
 * Truncated and byte-flipped copies of every fixture either read (a flipped byte may land in unused data) or
 * fail with InputRejected naming the file: never another exception (a stack trace for a user's file).
 */
class DamagedFilesTest {
    @TempDir
    Path dir;

    @Test
    void damagedFixturesFailOnlyWithInputRejected() throws IOException {
        Random rnd = new Random(7);
        List<String> others = new ArrayList<>();
        int rejected = 0;
        for (Path src : FixtureTest.fixtures("")) {
            String name = src.getFileName().toString();
            if (name.endsWith(".md")) continue;
            byte[] b = Files.readAllBytes(src);
            for (int k = 0; k < 12; k++) {
                byte[] d;
                if (k < 4) {
                    d = Arrays.copyOf(b, Math.max(1, (int) (b.length * (0.1 + 0.2 * k))));
                } else {
                    d = b.clone();
                    for (int j = 0; j < 1 + k; j++) d[rnd.nextInt(d.length)] = (byte) rnd.nextInt(256);
                }
                Path f = Files.write(dir.resolve(k + "-" + name), d);
                try {
                    FrameReaders.read(f, ReadContext.defaults());
                } catch (InputRejected e) {
                    rejected++;
                    assertTrue(e.getMessage().contains(f.getFileName().toString()), e.getMessage());
                } catch (RuntimeException e) {
                    others.add(f.getFileName() + ": " + e);
                }
            }
        }
        if (!others.isEmpty()) fail(others.size() + " damaged files escaped as other exceptions: " + others);
        assertTrue(rejected > 100, "most damaged files are refused: " + rejected);
    }
}
