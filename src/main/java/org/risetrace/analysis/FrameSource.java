package org.risetrace.analysis;

import org.risetrace.frame.Frame;

/** The frames of a series as the analysis reads them: names and times known up front, decoding on demand. */
public interface FrameSource {
    int size();

    String fileName(int i);

    double tSeconds(int i);

    /** Decodes frame i; must be safe to call from several threads at once. */
    Frame read(int i);
}
