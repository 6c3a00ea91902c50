/**
 * Coverage-guided fuzz targets (Jazzer), one class per reader so that the fuzz profile runs each in its own JVM
 * (Jazzer fuzzes one target per run). Under {@code mvn test} they run in regression mode on their seeds in
 * {@code src/test/resources/org/risetrace/fuzz/<Class>Inputs/<method>/}; see DEVELOPERS.md, "Hardening".
 */
package org.risetrace.fuzz;
