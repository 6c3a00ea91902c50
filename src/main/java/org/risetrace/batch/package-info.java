/**
 * Batch: finds every series under a folder, analyses each the way {@code risetrace analyze} does (series in
 * parallel), and writes each series' outputs plus summary.csv, summary.json and index.html; skips series whose
 * inputs and parameters are unchanged (a manifest per series), splits a batch into shards and merges them.
 * Uses the core (io, board, analysis, report); nothing of ours uses it but the CLI.
 */
package org.risetrace.batch;
