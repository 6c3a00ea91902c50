/**
 * The local web workbench ({@code risetrace serve}): an HTTP server on the JDK's {@code com.sun.net.httpserver}
 * with a JSON API and static pages bundled in the jar. Like the CLI it is a user interface only: it parses and
 * checks requests, calls the core (series import, board file, analysis, reports) and returns what the core
 * made; no analysis happens here, and nothing in the core depends on this package.
 */
package org.risetrace.web;
