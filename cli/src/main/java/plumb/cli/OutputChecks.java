package plumb.cli;

import picocli.CommandLine;
import picocli.CommandLine.Model.OptionSpec;
import picocli.CommandLine.Model.PositionalParamSpec;
import picocli.CommandLine.ParseResult;

import java.io.IOException;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collection;
import java.util.List;
import java.util.Set;

/**
 * Checks shared by every command before it runs: no output file may be one of the command's
 * input files (a model, a toy part) or another output, compared as real files (links and
 * relative names resolved), and none may lie below a file ("not a directory", found before the
 * computation rather than after it). "-" (standard input or output) is never compared.
 */
final class OutputChecks {

    /** Options that name a file or folder a command writes. */
    static final Set<String> OUTPUTS = Set.of("--json", "--csv", "--out", "--log", "--figure");

    private OutputChecks() {
    }

    /** Throws a ParameterException (exit status 2) when an output is an input or named twice. */
    static void check(ParseResult leaf) {
        CommandLine cl = leaf.commandSpec().commandLine();
        List<Path> inputs = new ArrayList<>();
        for (PositionalParamSpec p : leaf.matchedPositionals()) addPaths(p.getValue(), inputs);
        List<String> names = new ArrayList<>();
        List<Path> outputs = new ArrayList<>();
        for (OptionSpec o : leaf.matchedOptions()) {
            if (!OUTPUTS.contains(o.longestName())) continue;
            List<Path> values = new ArrayList<>();
            addPaths(o.getValue(), values);
            for (Path v : values) {
                names.add(o.longestName());
                outputs.add(v);
            }
        }
        for (int k = 0; k < outputs.size(); k++) {
            Path out = outputs.get(k);
            Path blocking = fileAmongParents(out);
            if (blocking != null) {
                // found now, not after the computation: the write would fail the same way
                throw new CommandLine.ParameterException(cl, "cannot write " + out + ": not a directory ("
                        + blocking + " is a file; given to " + names.get(k) + ")");
            }
            for (Path in : inputs) {
                if (sameFile(out, in) || Files.isDirectory(in) && readFrom(out, in)) {
                    throw new CommandLine.ParameterException(cl, names.get(k) + " " + out + ": is the input file "
                            + (sameFile(out, in) ? in : in.resolve(out.getFileName()))
                            + "; refusing to overwrite an input (choose another output name)");
                }
            }
            for (int j = 0; j < k; j++) {
                if (outputs.get(j).normalize().equals(out.normalize()) || sameFile(outputs.get(j), out)) {
                    throw new CommandLine.ParameterException(cl, names.get(k) + " " + out + ": is also the output of "
                            + names.get(j) + "; give each output its own file");
                }
            }
        }
    }

    /** The nearest existing parent folder of {@code out} when it is no folder (a file), else null. */
    private static Path fileAmongParents(Path out) {
        for (Path p = out.toAbsolutePath().normalize().getParent(); p != null; p = p.getParent()) {
            if (Files.exists(p)) return Files.isDirectory(p) ? null : p;
        }
        return null;
    }

    private static void addPaths(Object value, List<Path> into) {
        if (value instanceof Collection<?> c) {
            for (Object o : c) addPaths(o, into);
        } else if (value instanceof Path p) {
            if (!"-".equals(p.toString())) into.add(p);
        } else if (value instanceof String s && !s.isEmpty() && !"-".equals(s)) {
            try {
                into.add(Path.of(s));
            } catch (RuntimeException notAPath) {
                // a value that is no path cannot name an input; the command refuses it itself
            }
        }
    }

    /** Both exist and are one file (hard or symbolic links included). */
    static boolean sameFile(Path a, Path b) {
        try {
            return Files.exists(a) && Files.exists(b) && Files.isSameFile(a, b);
        } catch (IOException | SecurityException e) {
            return false;
        }
    }

    /** A folder input is read for its model files: an output among them would be read and replaced. */
    private static boolean readFrom(Path out, Path folder) {
        if (!Files.isRegularFile(out)) return false;
        try (DirectoryStream<Path> files = Files.newDirectoryStream(folder)) {
            for (Path f : files) if (sameFile(f, out)) return true;
        } catch (IOException | RuntimeException e) {
            return false;
        }
        return false;
    }
}
