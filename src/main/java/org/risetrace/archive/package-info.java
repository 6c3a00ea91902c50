/**
 * The evidence archive: a shop's store of cases, the original frames exactly as the camera exported them
 * (content-addressed by SHA-256, written once, read-only), the analyses and customer reports made from them, and an
 * append-only, hash-chained custody log of every action. The index is SQLite in the archive folder, or a shared
 * PostgreSQL server for several benches; the schema is the same. Cases leave and enter as BagIt bags (RFC 8493).
 * Uses io, board, analysis and report; nothing of ours uses it but the user interfaces.
 */
package org.risetrace.archive;
