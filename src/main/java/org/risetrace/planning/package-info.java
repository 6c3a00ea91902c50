/**
 * Planning: before the camera runs. The injection planner (supply settings, currents and powers by Ohm's and
 * Joule's laws, warnings, capture settings) and the bench meter readings (robust outlier test, ideal inductor
 * reactance). Uses frame and io (the series.json sidecar); nothing downstream.
 */
package org.risetrace.planning;
