package org.risetrace.cli;

import org.junit.jupiter.api.Test;
import picocli.CommandLine;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.util.List;
import java.util.Set;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The command tree is built for the command named only (a cold start reads fewer classes), and the help, an unknown
 * word and no command at all still see every command, in the order the help lists them.
 */
class CommandTreeTest {
    private static final List<String> ALL = List.of("inspect", "frame-view", "simulate", "board", "register", "analyze",
            "compare", "demo", "calibrate", "plan", "readings", "batch", "bench", "serve", "case", "help");

    @Test
    void aNamedCommandBuildsOnlyItself() {
        assertEquals(Set.of("analyze"), Main.commandLine(new String[]{"analyze", "x"}).getSubcommands().keySet());
        assertEquals(Set.of("case"), Main.commandLine(new String[]{"case", "list"}).getSubcommands().keySet());
    }

    @Test
    void helpUnknownWordsAndNoCommandBuildEveryCommandInHelpOrder() {
        for (String[] args : List.of(new String[0], new String[]{"--help"}, new String[]{"help", "analyze"},
                new String[]{"anlyze"}, new String[]{"-V"}))
            assertEquals(ALL, List.copyOf(Main.commandLine(args).getSubcommands().keySet()), String.join(" ", args));
        assertEquals(ALL, List.copyOf(Main.commandLine().getSubcommands().keySet()));
    }

    @Test
    void helpOfOneCommandAndTheUsageErrorsStillWork() {
        StringWriter out = new StringWriter();
        CommandLine cl = Main.commandLine(new String[]{"help", "analyze"});
        cl.setOut(new PrintWriter(out, true));
        assertEquals(Main.EXIT_OK, cl.execute("help", "analyze"));
        assertTrue(out.toString().contains("Usage: risetrace analyze"), out.toString());

        StringWriter err = new StringWriter();
        CommandLine one = Main.commandLine(new String[]{"analyze", "--no-such-option"});
        one.setErr(new PrintWriter(err, true));
        assertEquals(Main.EXIT_USAGE, one.execute("analyze", "--no-such-option"));
        assertTrue(err.toString().contains("try: risetrace analyze --help"), err.toString());

        StringWriter err2 = new StringWriter();
        CommandLine unknown = Main.commandLine(new String[]{"anlyze"});
        unknown.setErr(new PrintWriter(err2, true));
        assertEquals(Main.EXIT_USAGE, unknown.execute("anlyze"));
        assertTrue(err2.toString().contains("try: risetrace --help"), err2.toString());
    }
}
