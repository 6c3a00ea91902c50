package org.risetrace.analysis;

import org.risetrace.frame.Frame;
import org.risetrace.registration.BoardRaster;
import org.risetrace.registration.FrameRegistration;
import org.risetrace.registration.Homography;

/**
 * Maps frames onto the board: registration and rectification into board space. One instance per worker thread
 * ({@link #rectify} may reuse buffers); {@link #register} must be safe to share.
 */
public interface BoardMapper {
    FrameRegistration register(Frame frame);

    /** The frame resampled into board space; the result must not be reused by the mapper afterwards. */
    BoardRaster rectify(Frame frame, Homography boardToFrame);
}
