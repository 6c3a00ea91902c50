package org.risetrace.cli;

import org.risetrace.frame.InputRejected;
import picocli.CommandLine;
import picocli.CommandLine.Command;

/**
 * The {@code risetrace} command. Exit codes: 0 done, 1 input rejected (a file that cannot be used; one line on
 * stderr names it and the problem), 2 usage error (unknown command or option, missing argument).
 */
@Command(name = "risetrace", mixinStandardHelpOptions = true, versionProvider = VersionProvider.class,
        description = "Finds the part heating fastest on a current-injected board from thermal camera frames.",
        subcommands = {
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
                CommandLine.HelpCommand.class})
public final class Main implements Runnable {
    public static final int EXIT_OK = 0;
    public static final int EXIT_INPUT_REJECTED = 1;
    public static final int EXIT_USAGE = 2;
    /** A fault of the tool itself (a stack trace on stderr): please report it with the input that caused it. */
    public static final int EXIT_INTERNAL_ERROR = 3;

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
        CommandLine cl = commandLine();
        try {
            return cl.execute(args);
        } finally {
            cl.getOut().flush();
            cl.getErr().flush();
        }
    }

    public static CommandLine commandLine() {
        CommandLine cl = new CommandLine(new Main());
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
        cl.setParameterExceptionHandler((ex, args) -> {
            CommandLine c = ex.getCommandLine();
            c.getErr().println("risetrace: " + ex.getMessage());
            c.getErr().println("try: " + c.getCommandSpec().qualifiedName() + " --help");
            return EXIT_USAGE;
        });
        cl.setExitCodeExceptionMapper(t -> t instanceof InputRejected ? EXIT_INPUT_REJECTED : EXIT_INTERNAL_ERROR);
        return cl;
    }
}
