package plumb.cli;

import picocli.CommandLine.Parameters;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.model.Model;
import plumb.engine.model.ModelReader;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;

/** The MODEL argument of every model command: read, validated and compiled once. */
public final class ModelInput {

    @Parameters(index = "0", paramLabel = "MODEL", description = "Model file (.json or .json.gz).")
    Path file;

    private Loaded loaded;

    /** A model read from a file and compiled. */
    public record Loaded(Path file, Model model, CompiledModel compiled) {

        /** SHA-256 of the file's bytes, hex. */
        public String sha256() {
            try (InputStream in = Files.newInputStream(file)) {
                MessageDigest d = MessageDigest.getInstance("SHA-256");
                byte[] buf = new byte[1 << 16];
                for (int k; (k = in.read(buf)) > 0; ) d.update(buf, 0, k);
                return HexFormat.of().formatHex(d.digest());
            } catch (IOException | NoSuchAlgorithmException e) {
                return null;
            }
        }
    }

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
