package org.risetrace.web;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.cli.Main;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** {@code risetrace serve} refuses bad options as a usage error (exit 2, one line), before listening anywhere. */
class ServeCommandTest {
    static String[] run(String... args) {
        PrintStream err = System.err;
        ByteArrayOutputStream buf = new ByteArrayOutputStream();
        System.setErr(new PrintStream(buf, true, StandardCharsets.UTF_8));
        try {
            int code = Main.run(args);
            return new String[]{Integer.toString(code), buf.toString(StandardCharsets.UTF_8)};
        } finally {
            System.setErr(err);
        }
    }

    @Test
    void badOptionsAreUsageErrors(@TempDir Path dir) {
        String[] r = run("serve", "--root", dir.resolve("missing").toString(), "--port", "0");
        assertEquals("2", r[0], r[1]);
        assertTrue(r[1].contains("not a folder"), r[1]);
        r = run("serve", "--root", dir.toString(), "--port", "70000");
        assertEquals("2", r[0], r[1]);
        assertTrue(r[1].contains("--port"), r[1]);
        r = run("serve", "--root", dir.toString(), "--max-upload-mb", "0");
        assertEquals("2", r[0], r[1]);
        r = run("serve", "--bind", "300.1.2.3", "--root", dir.toString());
        assertEquals("2", r[0], r[1]);
        assertTrue(r[1].contains("--bind"), r[1]);
    }
}
