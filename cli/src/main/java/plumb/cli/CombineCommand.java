package plumb.cli;

import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;
import plumb.engine.model.Model;
import plumb.engine.model.ModelReader;
import plumb.engine.model.ModelWriter;
import plumb.engine.tooling.Combination;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.Callable;

/** {@code plumb combine A.json B.json … --out C.json}: one model from several (docs/model-tooling.md). */
@Command(name = "combine", mixinStandardHelpOptions = true,
        description = "Combine models into one: parameters with the same name are one parameter; --rename "
                + "decorrelates or aligns names first. Conflicts are refused naming both files.")
final class CombineCommand implements Callable<Integer> {

    @Parameters(arity = "2..*", paramLabel = "MODEL", description = "The models to combine, in order.")
    List<Path> models;

    @Option(names = "--rename", paramLabel = "FILE:OLD=NEW", description = "Rename parameter OLD of the model FILE (as given) to NEW; repeatable.")
    List<String> renames = new ArrayList<>();

    @Option(names = "--name", paramLabel = "NAME", description = "Name of the combined model (default: the names joined by '+').")
    String name;

    @Option(names = "--out", required = true, paramLabel = "FILE", description = "The combined model (.json or .json.gz).")
    Path out;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        Map<String, Map<String, String>> byFile = new LinkedHashMap<>();
        for (Path p : models) byFile.put(p.toString(), new LinkedHashMap<>());
        for (String r : renames) parseRename(r, byFile);
        List<Combination.Part> parts = new ArrayList<>();
        for (Path p : models) {
            Model m = ModelReader.read(p);
            parts.add(new Combination.Part(m, p.toString(), byFile.get(p.toString())));
        }
        Model combined;
        try {
            combined = Combination.combine(parts, name);
        } catch (plumb.engine.model.ModelException e) {
            throw new InputException(e.getMessage());
        }
        try {
            ModelWriter.write(combined, out);
        } catch (IOException | RuntimeException e) {
            throw new InputException("cannot write --out " + out + ": " + e.getMessage());
        }
        spec.commandLine().getOut().printf("wrote %s ('%s': %d models, %d channels)%n", out, combined.name(), models.size(),
                combined.channels().size());
        spec.commandLine().getOut().flush();
        return ExitCodes.OK;
    }

    private static void parseRename(String text, Map<String, Map<String, String>> byFile) {
        for (Map.Entry<String, Map<String, String>> f : byFile.entrySet()) {
            String prefix = f.getKey() + ":";
            if (!text.startsWith(prefix)) continue;
            String rest = text.substring(prefix.length());
            int eq = rest.lastIndexOf('=');
            if (eq <= 0 || eq == rest.length() - 1) break;
            String old = rest.substring(0, eq), neu = rest.substring(eq + 1);
            if (f.getValue().putIfAbsent(old, neu) != null) throw new InputException("--rename " + text + ": " + old + " is renamed twice");
            return;
        }
        throw new InputException("--rename " + text + ": expected FILE:OLD=NEW with FILE one of the models as given");
    }
}
