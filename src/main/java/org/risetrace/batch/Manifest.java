package org.risetrace.batch;

import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;
import org.risetrace.io.FrameReaders;
import org.risetrace.io.Series;
import org.risetrace.io.Sidecars;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;
import java.util.List;
import java.util.Locale;
import java.util.stream.Stream;

/**
 * batch-manifest.json beside a series' outputs, written last: what the outputs were made from. A re-run skips the
 * series when the inputs' hash, the parameters and the tool version are all unchanged, and takes its summary row
 * from here. No manifest (a run killed before it was written) means the outputs are not known to be complete.
 *
 * @param schema        "risetrace-batch-manifest/1"
 * @param version       tool version that made the outputs
 * @param inputsSha256  SHA-256 over the names and SHA-256s of the frame files, series.json, readings.csv and the
 *                      board file (see {@link #inputsSha256})
 * @param parameters    the analysis parameters, profile and mode, as one canonical JSON text
 * @param summary       the series' summary row
 */
@JsonPropertyOrder({"schema", "version", "inputs_sha256", "parameters", "summary"})
public record Manifest(
        @JsonProperty("schema") String schema,
        @JsonProperty("version") String version,
        @JsonProperty("inputs_sha256") String inputsSha256,
        @JsonProperty("parameters") String parameters,
        @JsonProperty("summary") SeriesSummary summary) {
    public static final String SCHEMA = "risetrace-batch-manifest/1";
    public static final String FILE_NAME = "batch-manifest.json";

    /** True when outputs made under {@code this} stand for the same inputs, parameters and tool. */
    boolean matches(String version, String inputsSha256, String parameters) {
        return SCHEMA.equals(schema) && java.util.Objects.equals(this.version, version)
                && java.util.Objects.equals(this.inputsSha256, inputsSha256)
                && java.util.Objects.equals(this.parameters, parameters) && summary != null;
    }

    static Manifest readOrNull(Path file) {
        if (!Files.isRegularFile(file)) return null;
        try {
            return BatchSummary.JSON.readValue(file.toFile(), Manifest.class);
        } catch (IOException e) {
            return null; // unreadable or from another version: the series is analysed again
        }
    }

    String toJson() {
        try {
            return BatchSummary.JSON.writeValueAsString(this).replace("\r\n", "\n") + "\n";
        } catch (IOException e) {
            throw new IllegalStateException(e);
        }
    }

    /**
     * SHA-256 over a line "name sha256-of-bytes" per input file, in name order: every file in the folder that the
     * analysis reads (frame extensions, series.json, readings.csv), then "board " and the board file's hash. The
     * bytes are hashed rather than sizes and times, so a copied or re-synced tree is still recognised.
     */
    static String inputsSha256(Path folder, Path boardFileOrNull) throws IOException {
        StringBuilder lines = new StringBuilder();
        List<Path> files;
        try (Stream<Path> s = Files.list(folder)) {
            files = s.filter(Files::isRegularFile).sorted().toList();
        }
        for (Path p : files) {
            String name = p.getFileName().toString();
            String lower = name.toLowerCase(Locale.ROOT);
            if (name.startsWith(".")) continue;
            if (FrameReaders.isImageFile(p) || lower.equals(Sidecars.FILE_NAME) || lower.equals(Series.BENCH_READINGS_FILE))
                lines.append(name).append(' ').append(sha256(p)).append('\n');
        }
        lines.append("board ").append(boardFileOrNull == null ? "none" : sha256(boardFileOrNull)).append('\n');
        return hex(digest().digest(lines.toString().getBytes(StandardCharsets.UTF_8)));
    }

    static String sha256(Path file) throws IOException {
        MessageDigest md = digest();
        byte[] buf = new byte[1 << 16];
        try (InputStream in = Files.newInputStream(file)) {
            for (int n; (n = in.read(buf)) > 0; ) md.update(buf, 0, n);
        }
        return hex(md.digest());
    }

    private static MessageDigest digest() {
        try {
            return MessageDigest.getInstance("SHA-256");
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
    }

    private static String hex(byte[] b) {
        return HexFormat.of().formatHex(b);
    }
}
