/** Report: analysis.json, parts.csv and the self-contained report.html with colour maps and plots. Uses analysis and below. */
package org.risetrace.report;
