package plumb.cli;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.stream.Stream;

/** Several models given on the command line, and the label that orders them (limits, report). */
final class ModelLabels {

    private ModelLabels() {
    }

    /** The model files named: files as given, folders expanded to their .json / .json.gz files by name. */
    static List<Path> modelFiles(List<Path> args) {
        List<Path> out = new ArrayList<>();
        for (Path p : args) {
            if (!Files.isDirectory(p)) {
                out.add(p);
                continue;
            }
            try (Stream<Path> s = Files.list(p)) {
                List<Path> found = s.filter(f -> Files.isRegularFile(f)
                        && (f.getFileName().toString().endsWith(".json") || f.getFileName().toString().endsWith(".json.gz")))
                        .sorted().toList();
                if (found.isEmpty()) throw new InputException(p + ": the folder holds no model files (.json, .json.gz)");
                out.addAll(found);
            } catch (IOException e) {
                throw new InputException(p + ": cannot list the folder: " + e.getMessage());
            }
        }
        return out;
    }

    /** --label, or the first numeric label every model has (null for a single model without one). */
    static String key(List<ModelInput.Loaded> loaded, String label) {
        if (label != null) return label;
        for (String k : loaded.get(0).compiled().labels().keySet()) {
            boolean all = true;
            for (ModelInput.Loaded l : loaded) all &= l.compiled().labels().get(k) instanceof Number;
            if (all) return k;
        }
        if (loaded.size() > 1) {
            throw new InputException("--label: the models share no numeric label to order the limits by; name one with --label");
        }
        return null;
    }

    /** The model's value of label {@code key} (NaN for no key). */
    static double x(ModelInput.Loaded l, String key) {
        if (key == null) return Double.NaN;
        Object v = l.compiled().labels().get(key);
        if (v instanceof Number n) return n.doubleValue();
        throw new InputException(String.format(Locale.ROOT, "--label %s: %s has no numeric label '%s' (labels.%s)",
                key, l.file(), key, key));
    }
}
