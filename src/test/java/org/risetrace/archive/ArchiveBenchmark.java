package org.risetrace.archive;

import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.cli.Main;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Random;

/**
 * Archive benchmark (nothing asserted; the numbers go to DEVELOPERS.md, "Evidence archive"):
 * <ol>
 * <li>Ingest throughput of {@code addSeries} (hash, copy, fsync, rename, record) against {@code sha256sum}
 * (GNU coreutils) over the same files in the same run, the hashing limit. 4 series x 40 frames of 655,360 bytes
 * (a 640 x 512 16-bit frame's size; random bytes, so nothing is stored twice), 105 MB; both read from the page
 * cache (every file read once before); rounds alternate the two.</li>
 * <li>{@code case list} and search times over an archive of 200 cases and 10,000 frame records (50 per case), in
 * process through {@link Main#run} (opening the archive included), median of 20.</li>
 * </ol>
 * Run: mvn -B -o test -Dbench.exclude=none -Dgroups=benchmark -Dtest=ArchiveBenchmark
 */
@Tag("benchmark")
class ArchiveBenchmark {
    @TempDir
    Path tmp;

    @Test
    void ingestAgainstSha256sumAndListingOverTwoHundredCases() throws Exception {
        Random random = new Random(13);
        List<Path> series = new ArrayList<>();
        List<String> files = new ArrayList<>();
        long bytes = 0;
        byte[] board = Files.readAllBytes(Path.of("sample-frames/phase-short/board.json"));
        for (int s = 0; s < 4; s++) {
            Path dir = Files.createDirectories(tmp.resolve("src/bench-" + s));
            StringBuilder sidecar = new StringBuilder("{\"profile\": \"u16-centikelvin\", \"frames\": {");
            for (int f = 1; f <= 40; f++) {
                byte[] b = new byte[640 * 512 * 2];
                random.nextBytes(b);
                Path p = dir.resolve(String.format(Locale.ROOT, "f%04d.png", f));
                Files.write(p, b);
                files.add(p.toString());
                bytes += b.length;
                sidecar.append(f == 1 ? "" : ", ").append("\"").append(p.getFileName()).append("\": {\"t_s\": ")
                        .append(0.5 * (f - 1)).append("}");
            }
            Files.writeString(dir.resolve("series.json"), sidecar.append("}}").toString());
            Files.write(dir.resolve("board.json"), board);
            series.add(dir);
        }
        List<String> cmd = new ArrayList<>(List.of("sha256sum"));
        cmd.addAll(files);
        run(cmd); // page cache
        int rounds = 3;
        double hashS = 0, ingestS = 0;
        for (int r = 0; r < rounds; r++) {
            long t0 = System.nanoTime();
            run(cmd);
            hashS += (System.nanoTime() - t0) / 1e9;
            try (Archive a = Archive.open(ArchiveSettings.sqlite(tmp.resolve("archive-" + r)), "bench")) {
                a.createCase(Fixtures.newCase("B-" + r));
                long t1 = System.nanoTime();
                for (Path s : series) a.addSeries("B-" + r, s, null, null);
                ingestS += (System.nanoTime() - t1) / 1e9;
            }
        }
        double mb = bytes / 1e6;
        System.out.printf(Locale.ROOT, "archive ingest: %.1f MB in %d files per round, %d rounds%n", mb, files.size(), rounds);
        System.out.printf(Locale.ROOT, "  sha256sum      %.3f s = %.0f MB/s%n", hashS / rounds, mb / (hashS / rounds));
        System.out.printf(Locale.ROOT, "  add-series     %.3f s = %.0f MB/s (%.2f of sha256sum)%n", ingestS / rounds,
                mb / (ingestS / rounds), hashS / ingestS);

        // 200 cases, 10,000 frame records
        Path small = Fixtures.series(tmp.resolve("small"), 11);
        List<Path> frames50 = new ArrayList<>();
        Path fifty = Files.createDirectories(tmp.resolve("fifty"));
        for (int f = 1; f <= 50; f++) {
            Path p = fifty.resolve(String.format(Locale.ROOT, "f%04d.png", f));
            Files.copy(small.resolve(String.format(Locale.ROOT, "f%04d.png", 1 + (f - 1) % 12)), p);
            frames50.add(p);
        }
        Files.writeString(fifty.resolve("series.json"), "{\"profile\": \"u16-centikelvin\", \"frame_interval_s\": 0.5}");
        Files.copy(small.resolve("board.json"), fifty.resolve("board.json"));
        Path big = tmp.resolve("archive-200");
        long t2 = System.nanoTime();
        try (Archive a = Archive.open(ArchiveSettings.sqlite(big), "bench")) {
            for (int c = 0; c < 200; c++) {
                String n = a.createCase(new Archive.NewCase(null, "ticket " + (1000 + c), (c % 2 == 0 ? "sensor board DB-12" : "charger DB-7")
                        + " unit " + c, "SN-" + c, c % 3 == 0 ? "no power" : "runs hot", "tech " + (c % 4))).caseNumber();
                a.addSeries(n, fifty, "bench", null);
                if (c % 5 == 0) a.setStatus(n, "closed");
            }
        }
        System.out.printf(Locale.ROOT, "archive of 200 cases and %d frame records built in %.1f s%n", 200 * frames50.size(),
                (System.nanoTime() - t2) / 1e9);
        String[][] queries = {
                {"case", "list", "--archive", big.toString()},
                {"case", "list", "--archive", big.toString(), "--status", "closed"},
                {"case", "search", "--archive", big.toString(), "db-12"},
                {"case", "search", "--archive", big.toString(), "SN-17"},
                {"case", "list", "--archive", big.toString(), "--from", "2026-01-01", "--to", "2030-12-31", "--text", "runs hot"}};
        for (String[] q : queries) Main.run(q); // warm
        for (String[] q : queries) {
            double[] ms = new double[20];
            int lines = 0;
            for (int i = 0; i < ms.length; i++) {
                PrintStream old = System.out;
                ByteArrayOutputStream out = new ByteArrayOutputStream();
                long t = System.nanoTime();
                try {
                    System.setOut(new PrintStream(out, true, StandardCharsets.UTF_8));
                    Main.run(q);
                } finally {
                    System.setOut(old);
                }
                ms[i] = (System.nanoTime() - t) / 1e6;
                lines = out.toString(StandardCharsets.UTF_8).split("\n").length - 1;
            }
            Arrays.sort(ms);
            System.out.printf(Locale.ROOT, "  %-60s %4d cases  median %.1f ms, max %.1f ms%n",
                    String.join(" ", Arrays.copyOfRange(q, 0, 2)) + " " + String.join(" ", Arrays.copyOfRange(q, 4, q.length)),
                    lines, ms[ms.length / 2], ms[ms.length - 1]);
        }
    }

    private static void run(List<String> cmd) throws Exception {
        Process p = new ProcessBuilder(cmd).redirectErrorStream(true).redirectOutput(ProcessBuilder.Redirect.DISCARD).start();
        if (p.waitFor() != 0) throw new IllegalStateException("sha256sum failed");
    }
}
