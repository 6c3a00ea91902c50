/**
 * Frame registration: mapping every frame onto the board in millimetres, its quality, and rectification into board
 * space. Uses {@code frame} and {@code board}.
 */
package org.risetrace.registration;
