/** The board file: size, outline marks, parts and ambient areas in board millimetres; placement import. Uses {@code frame}. */
package org.risetrace.board;
