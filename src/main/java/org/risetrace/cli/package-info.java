/** The command line: one class per command; parses, calls the core, prints. Nothing depends on this package. */
package org.risetrace.cli;
