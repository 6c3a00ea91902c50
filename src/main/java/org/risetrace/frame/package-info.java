/** The frame model: a temperature raster in degrees Celsius with its time and provenance. Depends on nothing of ours. */
package org.risetrace.frame;
