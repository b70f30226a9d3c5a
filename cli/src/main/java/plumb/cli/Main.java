package plumb.cli;

import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import plumb.cli.table.Escape;
import plumb.engine.inference.InferenceException;
import plumb.engine.inference.MemoryBudget;

import java.io.PrintWriter;

/** The {@code plumb} command: subcommands, and one place that turns failures into exit codes. */
@Command(name = "plumb", mixinStandardHelpOptions = true, versionProvider = Version.class,
        description = "Binned-likelihood fits with systematic uncertainties, from one JSON model file.")
public final class Main implements Runnable {

    /** The project version (from the build, see {@link Version}). */
    public static final String VERSION = Version.NUMBER;

    /**
     * The subcommands, in the order the help lists them. A command line gets only the one named
     * on it ({@link #commandLine(String)}): picocli reads a command's annotations by reflection
     * when it is added, and all of them together took about half of a cold start's CPU time.
     */
    static final java.util.List<Class<?>> COMMANDS = java.util.List.of(CheckCommand.class, FitCommand.class,
            GenerateCommand.class, ImpactsCommand.class, ScanCommand.class, YieldsCommand.class,
            LimitCommand.class, DiscoveryCommand.class, GofCommand.class,
            InjectCommand.class, MergeToysCommand.class, ReportCommand.class, DemoCommand.class,
            TidyCommand.class, SensitivityCommand.class, ProjectCommand.class, ContourCommand.class,
            ImportCommand.class, ExportCommand.class, CombineCommand.class, TemplatesCommand.class,
            BuildCommand.class);

    /** The system property picocli reads: regular expressions of the type names it adds no converter for. */
    static final String UNUSED_CONVERTERS_KEY = "picocli.converters.excludes";
    static final String UNUSED_CONVERTERS = "java\\.sql\\..*,java\\.time\\..*";

    @Option(names = "--debug", scope = CommandLine.ScopeType.INHERIT,
            description = "Print stack traces of failures.")
    boolean debug;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Override
    public void run() {
        spec.commandLine().usage(spec.commandLine().getOut());
    }

    public static void main(String[] args) {
        System.setProperty("java.awt.headless", "true");
        // picocli registers converters for java.sql and java.time by loading and initialising those
        // classes; no option here has such a type, and skipping them saves a few percent of the start
        if (System.getProperty(UNUSED_CONVERTERS_KEY) == null) System.setProperty(UNUSED_CONVERTERS_KEY, UNUSED_CONVERTERS);
        System.exit(execute(args, new PrintWriter(System.out, true), new PrintWriter(System.err, true)));
    }

    /** Runs one command line with the given writers; returns the exit status (used by tests). */
    public static int execute(String[] args, PrintWriter out, PrintWriter err) {
        String named = commandName(args);
        if (named != null && commandClass(named) == null) {
            err.println("plumb: unknown command '" + Escape.controls(named) + "'; the commands are: "
                    + String.join(", ", COMMANDS.stream().map(Main::nameOf).toList()) + " ('plumb --help' describes them)");
            err.flush();
            return ExitCodes.BAD_INPUT;
        }
        CommandLine cl = commandLine(named);
        cl.setOut(out);
        cl.setErr(err);
        try {
            return cl.execute(args);
        } catch (OutOfMemoryError e) {
            // the estimates before each allocation should prevent this; if one was short, still one
            // line and an exit, never a stack trace or a process left running
            err.println("plumb: out of memory (heap limit " + MemoryBudget.human(Runtime.getRuntime().maxMemory())
                    + "); give Java more with -Xmx, e.g. PLUMB_JAVA_OPTS=-Xmx16g, or ask for less");
            err.flush();
            return ExitCodes.FAILED;
        }
    }

    /**
     * The first argument that is not an option: the command's name (checked before picocli parses,
     * which would otherwise answer {@code plumb nosuch --help} with the top-level help), or null.
     */
    private static String commandName(String[] args) {
        for (String a : args) {
            if (a.startsWith("-")) continue;   // --debug before the command, or -h/--help/-V
            return a;
        }
        return null;
    }

    private static String nameOf(Class<?> command) {
        return command.getAnnotation(Command.class).name();
    }

    /** The subcommand class of that name, or null. */
    private static Class<?> commandClass(String name) {
        for (Class<?> c : COMMANDS) if (nameOf(c).equals(name)) return c;
        return null;
    }

    /**
     * The rule for result files on exit status 1 (docs/cli-contract.md): the --json file asked for
     * is always written. A command that failed before it had any result leaves this one:
     * {@code {"converged": false, "failure": "why"}}.
     */
    private static void writeFailure(CommandLine c, CommandLine.ParseResult parseResult, String why) {
        CommandLine.ParseResult leaf = parseResult;
        while (leaf.hasSubcommand()) leaf = leaf.subcommand();
        String json = leaf.matchedOptionValue("--json", null);
        if (json == null) return;
        com.fasterxml.jackson.databind.node.ObjectNode root = Json.failed(Json.object(), why);
        try {
            Outputs.write(json, Json.write(root), c.getOut());
        } catch (InputException e) {
            c.getErr().println(prefix(c) + Escape.controls(e.getMessage()));
        }
    }

    /** "plumb: " for the top command, "plumb fit: " for a subcommand. */
    private static String prefix(CommandLine c) {
        return c.getParent() == null ? "plumb: " : "plumb " + c.getCommandName() + ": ";
    }

    /** The configured command line with every subcommand: exit codes and error handling of docs/cli-contract.md. */
    public static CommandLine commandLine() {
        return commandLine((String) null);
    }

    /**
     * The configured command line with only the subcommand {@code name} (a known one), or with
     * all of them when name is null (the top-level help lists them).
     */
    static CommandLine commandLine(String name) {
        CommandLine cl = new CommandLine(new Main());
        for (Class<?> c : COMMANDS) {
            if (name == null || nameOf(c).equals(name)) cl.addSubcommand(c);
        }
        cl.setCaseInsensitiveEnumValuesAllowed(true);
        cl.setParameterExceptionHandler((ex, args) -> {
            CommandLine c = ex.getCommandLine();
            c.getErr().println(prefix(c) + Escape.controls(String.valueOf(ex.getMessage())));
            c.getErr().flush();
            return ExitCodes.BAD_INPUT;
        });
        // checks every command shares run after parsing and before the command itself
        CommandLine.IExecutionStrategy run = new CommandLine.RunLast();
        cl.setExecutionStrategy(parseResult -> {
            CommandLine.ParseResult leaf = parseResult;
            while (leaf.hasSubcommand()) leaf = leaf.subcommand();
            if (!leaf.isUsageHelpRequested() && !leaf.isVersionHelpRequested()) OutputChecks.check(leaf);
            return run.execute(parseResult);
        });
        cl.setExecutionExceptionHandler((ex, c, parseResult) -> {
            boolean debug = parseResult.hasMatchedOption("--debug")
                    || parseResult.subcommands().stream().anyMatch(p -> p.hasMatchedOption("--debug"));
            int code = ex instanceof plumb.engine.model.ModelException || ex instanceof InputException
                    || ex instanceof MemoryBudget.TooLargeException ? ExitCodes.BAD_INPUT : ExitCodes.FAILED;
            String what = ex.getMessage() == null ? ex.getClass().getSimpleName() : ex.getMessage();
            if (code == ExitCodes.FAILED && !(ex instanceof ComputationException || ex instanceof InferenceException)) {
                what = "internal error: " + what + (debug ? "" : " (run with --debug for details)");
            }
            if (ex instanceof ComputationException || ex instanceof InferenceException) {
                writeFailure(c, parseResult, what);
            }
            // one line whatever a name in the message holds: control characters made visible
            c.getErr().println(prefix(c) + Escape.controls(what));
            if (debug) ex.printStackTrace(c.getErr());
            c.getErr().flush();
            return code;
        });
        return cl;
    }
}
