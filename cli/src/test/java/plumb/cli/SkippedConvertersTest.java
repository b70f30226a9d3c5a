package plumb.cli;

import org.junit.jupiter.api.Test;
import picocli.CommandLine;
import picocli.CommandLine.Model.ArgSpec;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.TreeSet;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Main tells picocli to skip its java.sql and java.time converters (a faster start): that holds
 * only while no option or parameter of any command has such a type, which this test checks over
 * picocli's model of every command.
 */
class SkippedConvertersTest {

    @Test
    void noArgumentHasATypeWhoseConverterIsSkipped() {
        List<String> patterns = Arrays.asList(Main.UNUSED_CONVERTERS.split(","));
        TreeSet<String> clashes = new TreeSet<>();
        int checked = 0;
        List<CommandLine> all = new ArrayList<>(List.of(Main.commandLine()));
        for (int i = 0; i < all.size(); i++) {
            CommandLine c = all.get(i);
            all.addAll(c.getSubcommands().values());
            for (ArgSpec a : c.getCommandSpec().args()) {
                List<Class<?>> types = new ArrayList<>(List.of(a.type()));
                types.addAll(Arrays.asList(a.auxiliaryTypes()));
                for (Class<?> t : types) {
                    checked++;
                    String name = (t.isArray() ? t.getComponentType() : t).getName();
                    if (patterns.stream().anyMatch(name::matches)) clashes.add(c.getCommandName() + " " + a + ": " + name);
                }
            }
        }
        assertEquals(new TreeSet<String>(), clashes);
        assertTrue(checked > 100, "argument types checked: " + checked);
        // the patterns do match what they are meant to skip
        assertTrue(patterns.stream().anyMatch("java.time.Duration"::matches));
        assertTrue(patterns.stream().anyMatch("java.sql.Timestamp"::matches));
        assertTrue(patterns.stream().noneMatch("java.nio.file.Path"::matches));
    }
}
