/** Import: one reader per container format behind FrameReader, series discovery and ordering, the sidecar. Uses frame and calibration. */
package org.risetrace.io;
