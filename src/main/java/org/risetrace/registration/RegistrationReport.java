package org.risetrace.registration;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;

import java.util.List;

/**
 * The content of {@code registration.json}: one entry per frame and the overall quality.
 *
 * @param reference file name of the reference frame
 * @param pxPerMm   resolution of the rectified frames when written, else null
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
@JsonPropertyOrder({"reference", "px_per_mm", "frames", "summary"})
public record RegistrationReport(@JsonProperty("reference") String reference,
                                 @JsonProperty("px_per_mm") Double pxPerMm,
                                 @JsonProperty("frames") List<Entry> frames,
                                 @JsonProperty("summary") Summary summary) {

    /**
     * One frame; quality figures are null where not measured; homography maps board mm to frame px;
     * corner_sigma_px is the estimated RMS error of the four board corners (px).
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    @JsonPropertyOrder({"file", "t_s", "status", "reason", "corner_sigma_px", "rms_px", "inliers", "similarity",
            "homography", "board_corners_px"})
    public record Entry(@JsonProperty("file") String file,
                        @JsonProperty("t_s") double tSeconds,
                        @JsonProperty("status") RegistrationStatus status,
                        @JsonProperty("reason") String reason,
                        @JsonProperty("rms_px") Double rmsPx,
                        @JsonProperty("inliers") int inliers,
                        @JsonProperty("similarity") Double similarity,
                        @JsonProperty("homography") Homography homography,
                        @JsonProperty("board_corners_px") double[][] boardCornersPx,
                        @JsonProperty("corner_sigma_px") Double cornerSigmaPx) {

        public static Entry of(FrameRegistration r) {
            return new Entry(r.file(), r.tSeconds(), r.status(), r.reason(), finiteOrNull(r.rmsPx()), r.inliers(),
                    finiteOrNull(r.similarity()), r.boardToFrame(), r.boardCornersPx(), finiteOrNull(r.cornerSigmaPx()));
        }
    }

    /** Counts per status and the mean check-patch RMS over ok and weak frames. */
    @JsonPropertyOrder({"frames", "ok", "weak", "failed", "marked", "mean_rms_px"})
    public record Summary(@JsonProperty("frames") int frames,
                          @JsonProperty("ok") int ok,
                          @JsonProperty("weak") int weak,
                          @JsonProperty("failed") int failed,
                          @JsonProperty("marked") int marked,
                          @JsonProperty("mean_rms_px") Double meanRmsPx) {

        public static Summary of(List<FrameRegistration> rs) {
            int ok = 0, weak = 0, failed = 0, marked = 0, n = 0;
            double sum = 0;
            for (FrameRegistration r : rs) {
                switch (r.status()) {
                    case OK -> ok++;
                    case WEAK -> weak++;
                    case FAILED -> failed++;
                    case MARKED -> marked++;
                }
                if ((r.status() == RegistrationStatus.OK || r.status() == RegistrationStatus.WEAK)
                        && Double.isFinite(r.rmsPx())) {
                    sum += r.rmsPx();
                    n++;
                }
            }
            return new Summary(rs.size(), ok, weak, failed, marked, n == 0 ? null : sum / n);
        }
    }

    static Double finiteOrNull(double v) {
        return Double.isFinite(v) ? v : null;
    }
}
