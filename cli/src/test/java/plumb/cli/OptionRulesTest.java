package plumb.cli;

import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import plumb.engine.model.ModelWriter;
import plumb.models.SyntheticModels;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static plumb.cli.CommandLineTestSupport.run;

/**
 * One table: each shared option with a bad value, through each command that takes it. Every
 * cell must be refused the same way: exit status 2, one line on standard error naming the
 * option, nothing written.
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

    /** Each command with the arguments it needs besides the option under test. */
    private static final String[][] COMMANDS = {
            {"fit"}, {"impacts"}, {"scan"}, {"yields"}, {"discovery"}, {"limit"}, {"gof"},
            {"inject", "--mu", "1", "--toys", "2"},
    };

    /** Options every fitting command takes: the bad values and a word the refusal must contain. */
    private static final String[][] SHARED = {
            {"--threads 0", "--threads"},
            {"--threads -1", "--threads"},
            {"--threads x", "--threads"},
            {"--fix np_0=0.5 --fix np_0=1", "already held"},
            {"--fix nosuch=1", "no parameter 'nosuch'"},
            {"--fix np_0=Infinity", "finite"},
            {"--fix np_0", "expected NAME=X"},
    };

    /** Options of some commands. */
    private static final String[][] SPECIFIC = {
            {"limit", "--cl 1e-17", "--cl"},
            {"limit", "--cl 1", "--cl"},
            {"limit", "--cl 0.2", "--cl"},
            {"limit", "--toys 0", "--toys"},
            {"limit", "--toys 2147483647", "heap limit"},
            {"discovery", "--toys 0", "--toys"},
            {"discovery", "--toys 2147483647", "heap limit"},
            {"gof", "--toys -3", "--toys"},
            {"gof", "--toys 2147483647", "heap limit"},
            {"scan", "--points 1", "--points"},
            {"scan", "--points 1000000000", "heap limit"},
            {"impacts", "--fix mu=1", "the POI mu cannot be held"},
            {"impacts", "--top 0", "--top"},
            {"impacts", "--exact-top -1", "--exact-top"},
            {"inject", "--toys 2147483647", "--toys"},
            {"inject", "--count 0 --first 0", "--count"},
            {"fit", "--asimov-poi NaN --data asimov", "--asimov-poi"},
            {"report", "--threads 0", "--threads"},
            {"report", "--toys -1", "--toys"},
            {"report", "--impacts-top 0", "--impacts-top"},
    };

    static Stream<Arguments> cells() {
        List<Arguments> out = new ArrayList<>();
        for (String[] c : COMMANDS) for (String[] o : SHARED) out.add(Arguments.of(c[0], command(c, o[0]), o[1]));
        for (String[] s : SPECIFIC) {
            String[] base = Arrays.stream(COMMANDS).filter(c -> c[0].equals(s[0])).findFirst().orElse(new String[] {s[0]});
            out.add(Arguments.of(s[0], command(base, s[1]), s[2]));
        }
        return out.stream();
    }

    private static String[] command(String[] base, String option) {
        List<String> args = new ArrayList<>(List.of(base[0], "MODEL"));
        args.addAll(Arrays.asList(base).subList(1, base.length));
        if (base[0].equals("inject") && option.contains("--toys")) args.removeAll(List.of("--toys", "2"));
        if (base[0].equals("inject") && option.contains("--count")) args.removeAll(List.of("--toys", "2"));
        args.addAll(Arrays.asList(option.split(" ")));
        return args.toArray(String[]::new);
    }

    @ParameterizedTest(name = "{0}: {1}")
    @MethodSource("cells")
    void refusedAlikeEverywhere(String command, String[] args, String expected) {
        Path json = dir.resolve(command + "-out.json");
        List<String> full = new ArrayList<>();
        for (String a : args) full.add(a.equals("MODEL") ? model.toString() : a);
        if (command.equals("report")) full.addAll(List.of("--out", dir.resolve("report").toString()));
        else full.addAll(List.of("--json", json.toString()));
        var r = run(full.toArray(String[]::new));
        assertEquals(ExitCodes.BAD_INPUT, r.status(), String.join(" ", full) + "\n" + r.err());
        assertEquals(1, r.err().lines().count(), r.err());
        assertTrue(r.err().startsWith("plumb " + command + ": "), r.err());
        assertTrue(r.err().contains(expected), r.err());
        assertFalse(r.err().contains("internal error"), r.err());
        assertFalse(Files.exists(json), "no result file");
        assertFalse(Files.exists(dir.resolve("report")), "no report folder");
    }
}
