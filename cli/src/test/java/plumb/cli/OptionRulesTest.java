package plumb.cli;

import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Model.OptionSpec;
import picocli.CommandLine.Model.PositionalParamSpec;
import plumb.engine.model.ModelWriter;
import plumb.models.SyntheticModels;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static plumb.cli.CommandLineTestSupport.run;

/**
 * One table: each option with a bad value, through every command that takes it. The commands and
 * their options come from picocli's model of {@link Main}, so a new command is covered as soon as
 * it is registered, and a new numeric option fails {@link #everyNumericOptionHasARule()} until it
 * gets a rule here. Every cell must be refused the same way: exit status 2, one line on standard
 * error naming the option or the rule, nothing written.
 */
class OptionRulesTest {

    @TempDir
    static Path dir;
    static Path model;

    @BeforeAll
    static void smallModel() throws IOException {
        model = dir.resolve("small.json");
        ModelWriter.write(SyntheticModels.generate(1, 4, 2, 2, 3), model);
    }

    /** A bad value and a word the refusal must contain. */
    private record Bad(String value, String expected) {
    }

    private static Bad bad(String value, String expected) {
        return new Bad(value, expected);
    }

    /** Bad values of each option, for every command that has it. */
    private static final Map<String, List<Bad>> RULES = new LinkedHashMap<>();

    static {
        RULES.put("--threads", List.of(bad("0", "--threads"), bad("-1", "--threads"), bad("x", "--threads")));
        RULES.put("--fix", List.of(bad("np_0=0.5 --fix np_0=1", "already held"), bad("nosuch=1", "no parameter 'nosuch'"),
                bad("np_0=Infinity", "finite"), bad("np_0", "expected NAME=X"), bad("np_0=99", "outside the range"),
                bad("n\u001bp\u0007=1", "no parameter 'n\\ep\\u0007'")));   // control characters shown escaped
        for (String output : List.of("--json", "--csv", "--out", "--log", "--figure")) {
            RULES.put(output, List.of(bad("FILE/x.out", "not a directory")));   // FILE: a regular file
        }
        RULES.put("--toys", List.of(bad("-1", "--toys"), bad("x", "--toys"), bad("2147483647", "--toys")));
        RULES.put("--points", List.of(bad("1", "--points"), bad("1000000000", "heap limit")));
        RULES.put("--cl", List.of(bad("1e-17", "--cl"), bad("1", "--cl"), bad("0.2", "--cl"), bad("NaN", "--cl")));
        RULES.put("--top", List.of(bad("0", "--top"), bad("-5", "--top")));
        RULES.put("--exact-top", List.of(bad("-1", "--exact-top")));
        RULES.put("--impacts-top", List.of(bad("0", "--impacts-top")));
        RULES.put("--count", List.of(bad("0", "--count")));
        RULES.put("--first", List.of(bad("-1", "--first")));
        RULES.put("--rays", List.of(bad("0", "--rays"), bad("7", "--rays"), bad("1000000000", "heap limit")));
        RULES.put("--starts", List.of(bad("-1", "--starts"), bad("1000000000", "--starts")));
        RULES.put("--mu", List.of(bad("NaN", "--mu"), bad("1,Infinity", "--mu")));
        RULES.put("--asimov-poi", List.of(bad("NaN", "--asimov-poi")));
        RULES.put("--lumi", List.of(bad("0", "--lumi"), bad("-1", "--lumi"), bad("NaN", "--lumi"), bad("x", "--lumi")));
        RULES.put("--scale", List.of(bad("-1", "--scale"), bad("NaN", "--scale")));
        RULES.put("--reference", List.of(bad("NaN", "--reference"), bad("-1", "--reference")));
        RULES.put("--seed", List.of(bad("x", "--seed")));
        RULES.put("--spark-timeout", List.of(bad("0", "--spark-timeout")));
        RULES.put("--channels", List.of(bad("0", "--channels")));
        RULES.put("--bins", List.of(bad("0", "--bins"), bad("2000000000", "--bins")));
        RULES.put("--samples", List.of(bad("0", "--samples")));
        RULES.put("--nuisances", List.of(bad("-1", "--nuisances")));
        RULES.put("--split-norm", List.of(bad("-1", "--split-norm"), bad("NaN", "--split-norm")));
        RULES.put("--prune-norm", List.of(bad("-1", "--prune-norm"), bad("NaN", "--prune-norm")));
        RULES.put("--prune-shape", List.of(bad("-1", "--prune-shape"), bad("NaN", "--prune-shape")));
    }

    /** Commands whose result is about the POI: holding it makes no sense there. */
    private static final Set<String> POI_FREE = Set.of("impacts", "discovery", "limit", "inject", "sensitivity",
            "project", "report", "demo");

    /** Values of required options, by name. */
    private static String requiredValue(String command, String option) {
        return switch (option) {
            case "--out" -> Set.of("report", "demo", "templates").contains(command) ? "OUT/dir" : "OUT/out.json";
            case "--csv" -> "OUT/out.csv";
            case "--x" -> "mu";
            case "--y" -> "np_0";
            case "--mu" -> "1";
            default -> throw new AssertionError("no value for the required option " + option + " of " + command);
        };
    }

    /** Arguments a command needs besides the option under test (an inject run needs toys). */
    private static final Map<String, List<String>> EXTRA = Map.of("inject", List.of("--toys", "2"));

    private static Map<String, CommandSpec> commands() {
        Map<String, CommandSpec> out = new LinkedHashMap<>();
        Main.commandLine().getSubcommands().forEach((name, cl) -> out.put(name, cl.getCommandSpec()));
        return out;
    }

    /** Options whose value is not free text: numbers, or lists of them. */
    private static boolean numeric(OptionSpec o) {
        if (o.arity().max() == 0) return false;
        Class<?> t = o.type().isArray() || List.class.isAssignableFrom(o.type()) ? o.auxiliaryTypes()[0] : o.type();
        return t == int.class || t == Integer.class || t == long.class || t == Long.class || t == double.class || t == Double.class;
    }

    @Test
    void everyNumericOptionHasARule() {
        Set<String> missing = new TreeSet<>();
        commands().forEach((name, spec) -> {
            for (OptionSpec o : spec.options()) {
                if (numeric(o) && !RULES.containsKey(o.longestName())) missing.add(name + " " + o.longestName());
            }
        });
        assertEquals(Set.of(), missing, "numeric options without a rule in this table");
        assertTrue(commands().size() >= 20, "commands found: " + commands().keySet());
    }

    static Stream<Arguments> cells() {
        List<Arguments> out = new ArrayList<>();
        commands().forEach((name, spec) -> {
            for (OptionSpec o : spec.options()) {
                if (o.arity().max() == 0) continue;   // a flag takes no value
                List<Bad> bads = new ArrayList<>(RULES.getOrDefault(o.longestName(), List.of()));
                if (o.longestName().equals("--fix") && POI_FREE.contains(name)) bads.add(bad("mu=1", "cannot be held"));
                if (o.longestName().equals("--toys") && !Set.of("inject", "report", "demo").contains(name)) {
                    bads.add(bad("0", "--toys"));   // these three take 0 for "no toys"
                }
                if (o.longestName().equals("--fix") && name.equals("contour")) bads.add(bad("np_0=0", "np_0 is held"));   // the --y parameter
                for (Bad b : bads) {
                    // the demo runs its own model: a nuisance parameter of it instead of the small model's
                    String value = name.equals("demo") ? b.value().replace("np_0", "r_dijet") : b.value();
                    out.add(Arguments.of(name, o.longestName() + " " + value, b.expected()));
                }
            }
        });
        return out.stream();
    }

    @ParameterizedTest(name = "{0} {1}")
    @MethodSource("cells")
    void refusedAlikeEverywhere(String command, String option, String expected) throws IOException {
        CommandSpec spec = commands().get(command);
        Path outDir = Files.createDirectories(dir.resolve("out-" + Math.abs((command + option).hashCode())));
        List<String> args = new ArrayList<>(List.of(command));
        for (PositionalParamSpec p : spec.positionalParameters()) {
            for (int k = 0; k < Math.max(1, p.arity().min()); k++) args.add(model.toString());   // a model, or a file at least
        }
        String[] tested = option.replace("FILE", model.toString()).split(" ");
        for (OptionSpec o : spec.options()) {
            if (o.required() && !o.longestName().equals(tested[0])) {
                args.add(o.longestName());
                args.add(requiredValue(command, o.longestName()).replace("OUT", outDir.toString()));
            }
        }
        boolean countsToys = tested[0].equals("--toys") || tested[0].equals("--count") || tested[0].equals("--first");
        if (!countsToys) args.addAll(EXTRA.getOrDefault(command, List.of()));
        if (tested[0].equals("--first")) args.addAll(List.of("--count", "2"));
        args.addAll(Arrays.asList(tested));
        // every output a command can write goes into outDir, which must stay empty
        for (String output : List.of("--json", "--out", "--csv", "--log", "--figure")) {
            OptionSpec o = spec.findOption(output);
            if (o != null && !o.required() && !tested[0].equals(output)) {
                args.addAll(List.of(output, outDir.resolve("result" + output.substring(2)).toString()));
            }
        }

        var r = run(args.toArray(String[]::new));
        String line = String.join(" ", args) + "\n" + r.err();
        assertEquals(ExitCodes.BAD_INPUT, r.status(), line);
        assertEquals(1, r.err().lines().count(), line);
        assertTrue(r.err().startsWith("plumb " + command + ": "), line);
        assertTrue(r.err().contains(expected), "expected '" + expected + "': " + line);
        assertFalse(r.err().contains("internal error"), line);
        assertTrue(r.err().strip().chars().noneMatch(c -> c < 0x20 || c == 0x7f), "no raw control character: " + line);
        try (var left = Files.list(outDir)) {
            assertEquals(List.of(), left.toList(), "nothing written: " + line);
        }
    }
}
