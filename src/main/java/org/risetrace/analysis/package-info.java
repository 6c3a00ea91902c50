/** Analysis: board-space sampling, baseline, rise curves, fits, ranking and verdict, hot spots, lock-in. Uses the stages above. */
package org.risetrace.analysis;
