/**
 * Small numeric routines every stage may use (order statistics). Depends on nothing of ours, like {@code frame}.
 */
package org.risetrace.numeric;
