/**
 * A second synthetic series generator in test scope, deliberately different from {@code org.risetrace.sim} in
 * every modelling choice (closed-form spreading-spot heat instead of finite volumes, an emissivity picture warped by
 * OpenCV instead of a pinhole renderer, a linear emissivity mix instead of band radiance, OpenCV's PNG encoder
 * instead of the JDK's), so the analysis' confidence can be checked on captures our own simulator did not make.
 * {@link org.risetrace.synth.SpotSeries} generates a series folder with its truth; {@link org.risetrace.synth.SpotTruth}
 * maps frames with the true homographies so the analysis can be tested without registration.
 */
package org.risetrace.synth;
