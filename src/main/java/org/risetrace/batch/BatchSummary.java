package org.risetrace.batch;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import org.risetrace.frame.InputRejected;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

/**
 * summary.json: every series of a batch (or of one shard) in order of relative path. No clock time in it, so two
 * runs over the same inputs, or merged shards and one whole run, give the same document.
 *
 * @param schema  "risetrace-batch/1"
 * @param version tool version
 * @param shard   "i/n" for a shard's summary, null for a whole or merged batch
 * @param total   series in it
 * @param failed  series that failed
 * @param series  one row per series
 */
@JsonPropertyOrder({"schema", "version", "shard", "total", "failed", "series"})
public record BatchSummary(
        @JsonProperty("schema") String schema,
        @JsonProperty("version") String version,
        @JsonInclude(JsonInclude.Include.NON_NULL) @JsonProperty("shard") String shard,
        @JsonProperty("total") int total,
        @JsonProperty("failed") int failed,
        @JsonProperty("series") List<SeriesSummary> series) {
    public static final String SCHEMA = "risetrace-batch/1";
    public static final String JSON_FILE = "summary.json";

    static final ObjectMapper JSON = new ObjectMapper()
            .enable(SerializationFeature.INDENT_OUTPUT)
            .enable(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES);

    public BatchSummary {
        series = List.copyOf(series);
    }

    static BatchSummary of(String version, Shard shard, List<SeriesSummary> rows) {
        int failed = (int) rows.stream().filter(SeriesSummary::failed).count();
        return new BatchSummary(SCHEMA, version, shard == null || shard.count() == 1 ? null : shard.toString(),
                rows.size(), failed, rows);
    }

    String toJson() {
        try {
            return JSON.writeValueAsString(this).replace("\r\n", "\n") + "\n";
        } catch (IOException e) {
            throw new IllegalStateException(e);
        }
    }

    /** Reads a batch output folder's summary.json. */
    public static BatchSummary read(Path file) {
        if (!Files.isRegularFile(file))
            throw new InputRejected(file, "no summary.json", "name the output folders of 'risetrace batch' runs");
        try {
            BatchSummary s = JSON.readValue(file.toFile(), BatchSummary.class);
            if (!SCHEMA.equals(s.schema())) throw new InputRejected(file, "schema '" + s.schema() + "', expected " + SCHEMA);
            return s;
        } catch (IOException e) {
            throw new InputRejected(file, "not a batch summary: " + oneLine(e.getMessage()));
        }
    }

    static String oneLine(String s) {
        return s == null ? "" : s.replaceAll("\\s*\\R\\s*", " ").strip();
    }
}
