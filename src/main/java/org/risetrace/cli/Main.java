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
                SimulateCommand.class,
                BoardCommand.class,
                RegisterCommand.class,
                AnalyzeCommand.class,
                CompareCommand.class,
                DemoCommand.class,
                CalibrateCommand.class,
                PlanCommand.class, ReadingsCommand.class,
                BatchCommand.class,
                CommandLine.HelpCommand.class})
public final class Main implements Runnable {
    public static final int EXIT_OK = 0;
    public static final int EXIT_INPUT_REJECTED = 1;
    public static final int EXIT_USAGE = 2;

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
        return commandLine().execute(args);
    }

    public static CommandLine commandLine() {
        CommandLine cl = new CommandLine(new Main());
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
        cl.setExitCodeExceptionMapper(t -> t instanceof InputRejected ? EXIT_INPUT_REJECTED : 3);
        return cl;
    }
}
