package org.risetrace.cli;

import org.risetrace.frame.InputRejected;
import picocli.CommandLine;
import picocli.CommandLine.Command;

import java.util.List;

/**
 * The {@code risetrace} command. Exit codes: 0 done, 1 input rejected (a file that cannot be used; one line on
 * stderr names it and the problem), 2 usage error (unknown command or option, missing argument).
 */
@Command(name = "risetrace", mixinStandardHelpOptions = true, versionProvider = VersionProvider.class,
        description = "Finds the part heating fastest on a current-injected board from thermal camera frames.")
public final class Main implements Runnable {
    public static final int EXIT_OK = 0;
    public static final int EXIT_INPUT_REJECTED = 1;
    public static final int EXIT_USAGE = 2;
    /** A fault of the tool itself (a stack trace on stderr): please report it with the input that caused it. */
    public static final int EXIT_INTERNAL_ERROR = 3;

    /** The subcommands in the order the help lists them. */
    private static final List<Class<?>> SUBCOMMANDS = List.of(
            InspectCommand.class,
            FrameViewCommand.class,
            SimulateCommand.class,
            BoardCommand.class,
            RegisterCommand.class,
            AnalyzeCommand.class,
            CompareCommand.class,
            DemoCommand.class,
            CalibrateCommand.class,
            PlanCommand.class, ReadingsCommand.class,
            BatchCommand.class, BenchCommand.class,
            ServeCommand.class,
            CaseCommand.class,
            CommandLine.HelpCommand.class);

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Override
    public void run() {
        throw new CommandLine.ParameterException(spec.commandLine(), "name a command (risetrace --help lists them)");
    }

    public static void main(String[] args) {
        System.exit(run(args));
    }

    /** Runs the command line and returns the exit code (tests call this instead of main). */
    public static int run(String... args) {
        if (args.length > 0 && READS_SERIES.contains(args[0])) warmUpReaders();
        CommandLine cl = commandLine(args);
        try {
            return cl.execute(args);
        } finally {
            cl.getOut().flush();
            cl.getErr().flush();
        }
    }

    /** The whole command tree. */
    public static CommandLine commandLine() {
        return commandLine(new String[0]);
    }

    /**
     * The command tree for these arguments: when the first one names a subcommand, only that subcommand is built
     * (picocli reads every command's options by reflection, which took about a fifth of a second of a cold
     * single-series run for the subcommands not used); otherwise (help, no or an unknown command) all of them.
     */
    static CommandLine commandLine(String[] args) {
        CommandLine cl = new CommandLine(new Main());
        Class<?> only = args.length == 0 ? null : named(args[0]);
        for (Class<?> c : only != null ? List.<Class<?>>of(only) : SUBCOMMANDS) cl.addSubcommand(c);
        // control characters from user files (designators, file names) never reach the terminal
        cl.setOut(new java.io.PrintWriter(new TerminalSafeWriter(new java.io.OutputStreamWriter(System.out,
                java.nio.charset.StandardCharsets.UTF_8)), true));
        cl.setErr(new java.io.PrintWriter(new TerminalSafeWriter(new java.io.OutputStreamWriter(System.err,
                java.nio.charset.StandardCharsets.UTF_8)), true));
        cl.setExecutionExceptionHandler((ex, commandLine, parseResult) -> {
            Throwable t = ex;
            while (t != null && !(t instanceof InputRejected)) t = t.getCause();
            if (t != null) {
                commandLine.getErr().println("risetrace: " + t.getMessage());
                return EXIT_INPUT_REJECTED;
            }
            throw ex;
        });
        cl.setParameterExceptionHandler((ex, rest) -> {
            CommandLine c = ex.getCommandLine();
            c.getErr().println("risetrace: " + ex.getMessage());
            c.getErr().println("try: " + c.getCommandSpec().qualifiedName() + " --help");
            return EXIT_USAGE;
        });
        cl.setExitCodeExceptionMapper(t -> t instanceof InputRejected ? EXIT_INPUT_REJECTED : EXIT_INTERNAL_ERROR);
        return cl;
    }

    /** Commands that read a series folder (sidecar, board file, materials) first. */
    private static final java.util.Set<String> READS_SERIES = java.util.Set.of("analyze", "compare", "register", "batch");

    /**
     * Reads nothing: prepares the JSON readers of the series' sidecar, the board file and the materials table on a
     * second core while the main thread builds the command line (both take a cold process a tenth of a second).
     */
    private static void warmUpReaders() {
        Thread t = new Thread(() -> {
            org.risetrace.io.Sidecars.warmUp();
            org.risetrace.board.BoardFile.warmUp();
            try {
                org.risetrace.calibration.Materials.load();
            } catch (RuntimeException | LinkageError ignored) {
                // the command loads (and reports) it on its own
            }
        }, "risetrace-reader-warm-up");
        t.setDaemon(true);
        t.start();
    }

    /** The subcommand class named (or aliased) by this word, except help; null when none is. */
    private static Class<?> named(String word) {
        for (Class<?> c : SUBCOMMANDS) {
            Command a = c.getAnnotation(Command.class);
            if (a == null || c == CommandLine.HelpCommand.class) continue;
            if (a.name().equals(word) || List.of(a.aliases()).contains(word)) return c;
        }
        return null;
    }
}
