/** Calibration: encoding profiles (count to temperature), radiometry (band radiance, emissivity correction), materials. Uses {@code frame}. */
package org.risetrace.calibration;
