/** Simulation: a board heat model, a camera model and scenario files that write frames with their ground truth. Uses io writers, board and calibration. */
package org.risetrace.sim;
