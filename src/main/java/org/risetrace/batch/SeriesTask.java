package org.risetrace.batch;

import java.nio.file.Path;

/**
 * One series found under a batch root.
 *
 * @param folder       the folder of frames (the root resolved with the relative path)
 * @param relativePath the folder relative to the root, '/'-separated; "." for the root itself
 * @param boardFile    its own board.json or the nearest parent's up to the root; null when there is none
 */
public record SeriesTask(Path folder, String relativePath, Path boardFile) {
}
