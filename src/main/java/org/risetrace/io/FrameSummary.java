package org.risetrace.io;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;
import org.risetrace.frame.Frame;

/**
 * What {@code risetrace inspect} reports for one frame. Temperatures are over the pixels with a reading (NaN
 * pixels are left out); null when no pixel has one.
 */
@JsonInclude(JsonInclude.Include.ALWAYS)
public record FrameSummary(
        @JsonProperty("file") String file,
        @JsonProperty("container") String container,
        @JsonProperty("width") int width,
        @JsonProperty("height") int height,
        @JsonProperty("bit_depth") int bitDepth,
        @JsonProperty("profile") String profile,
        @JsonProperty("min_c") Double minC,
        @JsonProperty("mean_c") Double meanC,
        @JsonProperty("max_c") Double maxC,
        @JsonProperty("t_s") double tS,
        @JsonProperty("instant") String instant,
        @JsonProperty("sha256") String sha256,
        @JsonProperty("detail") String detail) {

    public static FrameSummary of(String file, Frame f) {
        float[] c = f.celsius();
        double min = Double.POSITIVE_INFINITY, max = Double.NEGATIVE_INFINITY, sum = 0;
        long n = 0;
        for (float v : c) {
            if (Float.isNaN(v)) continue;
            if (v < min) min = v;
            if (v > max) max = v;
            sum += v;
            n++;
        }
        return new FrameSummary(file, f.decoding().container(), f.width(), f.height(), f.decoding().bitDepth(),
                f.decoding().profile(), n == 0 ? null : min, n == 0 ? null : sum / n, n == 0 ? null : max,
                f.tSeconds(), f.instant() == null ? null : f.instant().toString(), f.sha256(), f.decoding().detail());
    }
}
