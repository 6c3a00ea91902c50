/**
 * {@code risetrace bench}: generates its own synthetic series (the simulator), then measures in one run the rates
 * of the bare JDK decode, the import, import and registration and the full analysis, batch throughput, a cold
 * process and the heap as the series grows. Uses the core ({@code sim}, {@code io}, {@code registration},
 * {@code analysis}, {@code report}, {@code batch}); only the command line uses it.
 */
package org.risetrace.bench;
