package org.risetrace.analysis;

import com.fasterxml.jackson.annotation.JsonProperty;

/**
 * One source frame as the analysis used it.
 *
 * @param file         file name
 * @param tS           series time
 * @param sha256       SHA-256 of the file's bytes
 * @param used         false when the frame was left out (registration failed)
 * @param registration how it was mapped onto the board
 */
public record FrameRecord(
        @JsonProperty("file") String file,
        @JsonProperty("t_s") double tS,
        @JsonProperty("sha256") String sha256,
        @JsonProperty("used") boolean used,
        @JsonProperty("registration") Registration registration) {

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
