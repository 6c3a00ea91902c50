package org.risetrace.analysis;

import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;

/**
 * One source frame as the analysis used it.
 *
 * @param file         file name
 * @param tS           series time
 * @param sha256       SHA-256 of the file's bytes
 * @param used         false when the frame was left out (registration failed)
 * @param registration how it was mapped onto the board
 * @param instant      absolute capture time from the image metadata (ISO-8601), null when the file gives none
 */
@JsonPropertyOrder({"file", "t_s", "instant", "sha256", "used", "registration"})
public record FrameRecord(
        @JsonProperty("file") String file,
        @JsonProperty("t_s") double tS,
        @JsonProperty("sha256") String sha256,
        @JsonProperty("used") boolean used,
        @JsonProperty("registration") Registration registration,
        @JsonProperty("instant") String instant) {

    /** Without a capture instant. */
    public FrameRecord(String file, double tS, String sha256, boolean used, Registration registration) {
        this(file, tS, sha256, used, registration, null);
    }

    /** This record with its capture instant (null: none). */
    public FrameRecord withInstant(java.time.Instant at) {
        return new FrameRecord(file, tS, sha256, used, registration, at == null ? null : at.toString());
    }

    /**
     * @param status         ok, weak, failed or marked
     * @param rmsPx          residual RMS in pixels
     * @param reason         why weak or failed
     * @param boardCornersPx the four board corners in the frame's pixels (outline order)
     * @param cornerSigmaPx  estimated RMS error of those corners in frame pixels (null when not estimated)
     */
    public record Registration(
            @JsonProperty("status") String status,
            @JsonProperty("rms_px") Double rmsPx,
            @JsonProperty("reason") String reason,
            @JsonProperty("board_corners_px") double[][] boardCornersPx,
            @JsonProperty("corner_sigma_px") Double cornerSigmaPx) {

        /** Without an uncertainty estimate. */
        public Registration(String status, Double rmsPx, String reason, double[][] boardCornersPx) {
            this(status, rmsPx, reason, boardCornersPx, null);
        }
    }
}
