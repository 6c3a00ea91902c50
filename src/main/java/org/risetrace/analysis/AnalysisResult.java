package org.risetrace.analysis;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;
import org.risetrace.io.Sidecar;
import org.risetrace.planning.BenchReadings;

import java.util.List;
import java.util.Map;

/**
 * The analysis.json document (schema documented in the README, section "analysis.json"). Stable: fields are only
 * ever added.
 *
 * @param schema      schema version, "risetrace-analysis/1"
 * @param tool        "risetrace"
 * @param version     tool version
 * @param createdUtc  ISO-8601 instant the analysis ran
 * @param series      the series folder analysed (as given)
 * @param board       the board file used
 * @param profile     calibration profile name
 * @param parameters  every tunable the analysis used, by name
 * @param injection   the sidecar's injection record (may be null)
 * @param verdict     the answer
 * @param parts       per part, in rank order
 * @param hotspots    local maxima of the rise map, hottest first
 * @param frames      every source frame with its hash and registration
 * @param benchReadings the series folder's bench meter readings, assessed (null: the folder has none)
 * @param seriesWarnings what reading the series assumed or left out (an assumed profile or frame interval, skipped
 *                      files): the numbers rest on it, so the evidence carries it (empty: nothing; absent in JSON)
 */
@JsonPropertyOrder({"schema", "tool", "version", "created_utc", "series", "board", "profile", "parameters",
        "injection", "verdict", "parts", "hotspots", "frames", "bench_readings", "series_warnings"})
public record AnalysisResult(
        @JsonProperty("schema") String schema,
        @JsonProperty("tool") String tool,
        @JsonProperty("version") String version,
        @JsonProperty("created_utc") String createdUtc,
        @JsonProperty("series") String series,
        @JsonProperty("board") String board,
        @JsonProperty("profile") String profile,
        @JsonProperty("parameters") Map<String, Object> parameters,
        @JsonProperty("injection") Sidecar.Injection injection,
        @JsonProperty("verdict") Verdict verdict,
        @JsonProperty("parts") List<PartResult> parts,
        @JsonProperty("hotspots") List<Hotspot> hotspots,
        @JsonProperty("frames") List<FrameRecord> frames,
        @JsonInclude(JsonInclude.Include.NON_NULL) @JsonProperty("bench_readings") BenchReadings benchReadings,
        @JsonInclude(JsonInclude.Include.NON_EMPTY) @JsonProperty("series_warnings") List<String> seriesWarnings) {

    public static final String SCHEMA = "risetrace-analysis/1";

    /** A result without bench readings. */
    public AnalysisResult(String schema, String tool, String version, String createdUtc, String series, String board,
                          String profile, Map<String, Object> parameters, Sidecar.Injection injection, Verdict verdict,
                          List<PartResult> parts, List<Hotspot> hotspots, List<FrameRecord> frames) {
        this(schema, tool, version, createdUtc, series, board, profile, parameters, injection, verdict, parts,
                hotspots, frames, null, List.of());
    }

    public AnalysisResult {
        seriesWarnings = seriesWarnings == null ? List.of() : List.copyOf(seriesWarnings);
    }

    /** This result with other frame records (the same frames, with more said about them). */
    public AnalysisResult withFrames(List<FrameRecord> records) {
        return new AnalysisResult(schema, tool, version, createdUtc, series, board, profile, parameters, injection,
                verdict, parts, hotspots, records, benchReadings, seriesWarnings);
    }

    /** This result with the bench readings of its series folder. */
    public AnalysisResult withBenchReadings(BenchReadings readings) {
        return new AnalysisResult(schema, tool, version, createdUtc, series, board, profile, parameters, injection,
                verdict, parts, hotspots, frames, readings, seriesWarnings);
    }

    /** This result with what reading its series assumed or left out. */
    public AnalysisResult withSeriesWarnings(List<String> warnings) {
        return new AnalysisResult(schema, tool, version, createdUtc, series, board, profile, parameters, injection,
                verdict, parts, hotspots, frames, benchReadings, warnings);
    }

    /** This result with one more parameter recorded (after those it has). */
    public AnalysisResult withParameter(String name, Object value) {
        Map<String, Object> more = new java.util.LinkedHashMap<>(parameters == null ? Map.of() : parameters);
        more.put(name, value);
        return new AnalysisResult(schema, tool, version, createdUtc, series, board, profile, more, injection,
                verdict, parts, hotspots, frames, benchReadings, seriesWarnings);
    }
}
