package plumb.cli;

import picocli.CommandLine.Parameters;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.model.Model;
import plumb.engine.model.ModelReader;

import java.nio.file.Path;

/** The MODEL argument of every model command: read, validated and compiled once. */
public final class ModelInput {

    @Parameters(index = "0", paramLabel = "MODEL", description = "Model file (.json or .json.gz).")
    Path file;

    private Loaded loaded;

    /** A model read from a file and compiled. */
    public record Loaded(Path file, Model model, CompiledModel compiled) { }

    public Loaded load() {
        if (loaded == null) loaded = load(file);
        return loaded;
    }

    /** Reads and compiles a model file; a bad file throws ModelException (exit status 2). */
    public static Loaded load(Path file) {
        Model model = ModelReader.read(file);
        return new Loaded(file, model, ModelCompiler.compile(model));
    }
}
