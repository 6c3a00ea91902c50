package org.risetrace.registration;

import org.risetrace.frame.Frame;

/**
 * Maps frames onto the board. Implementations are thread-safe: one instance may register frames from several
 * threads at once (each thread keeps its own work buffers).
 */
public interface Registrar {
    /** Never throws for a bad frame: a frame that cannot be mapped comes back FAILED with its reason. */
    FrameRegistration register(Frame frame);
}
