/**
 * Frame writers: thermal rasters to the containers cameras export (16-bit grey PNG, 16-bit and 32-bit float TIFF,
 * 8-bit grey PNG over a span). Used by the simulator; the import stage reads them back. Uses frame and calibration.
 */
package org.risetrace.io.write;
