package plumb.cli;

import picocli.CommandLine.Parameters;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.model.Model;
import plumb.engine.model.ModelException;
import plumb.engine.model.ModelReader;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.nio.file.Files;
import java.nio.file.Path;

/** The MODEL argument of every model command: read, validated and compiled once; "-" reads standard input. */
public final class ModelInput {

    /** How a model read from standard input is named in messages. */
    static final String STDIN_NAME = "standard input";

    @Parameters(index = "0", paramLabel = "MODEL", description = "Model file (.json or .json.gz); '-' reads standard input.")
    Path file;

    private Loaded loaded;

    /**
     * A model read from a file and compiled.
     *
     * @param content a file holding the model's bytes, to hash or read again: {@code file} itself,
     *                or a private copy of standard input
     */
    public record Loaded(Path file, Model model, CompiledModel compiled, Path content) {
        public Loaded(Path file, Model model, CompiledModel compiled) {
            this(file, model, compiled, file);
        }

        /** SHA-256 of the file's bytes, in hex: what identifies the model of a run. */
        public String sha256() {
            try (java.io.InputStream in = new java.security.DigestInputStream(java.nio.file.Files.newInputStream(content),
                    java.security.MessageDigest.getInstance("SHA-256"))) {
                in.transferTo(java.io.OutputStream.nullOutputStream());
                return java.util.HexFormat.of().formatHex(((java.security.DigestInputStream) in).getMessageDigest().digest());
            } catch (java.io.IOException e) {
                throw new InputException(file + ": cannot read: " + Outputs.cause(e));
            } catch (java.security.NoSuchAlgorithmException e) {
                throw new IllegalStateException(e); // every Java platform has SHA-256
            }
        }
    }

    public Loaded load() {
        if (loaded == null) loaded = load(file);
        return loaded;
    }

    /** Reads and compiles a model file ("-": standard input); a bad file throws ModelException (exit status 2). */
    public static Loaded load(Path file) {
        if (!"-".equals(file.toString())) {
            Model model = ModelReader.read(file);
            return new Loaded(file, model, ModelCompiler.compile(model));
        }
        Path copy = copyOfStandardInput();
        Model model;
        try (InputStream in = Files.newInputStream(copy)) {
            model = ModelReader.read(in, STDIN_NAME);
        } catch (IOException e) {
            throw new ModelException(STDIN_NAME, "", "cannot read: %s", Outputs.cause(e));
        }
        return new Loaded(file, model, ModelCompiler.compile(model), copy);
    }

    /**
     * Standard input copied to a private temporary file (removed when the program ends): commands
     * that record the model's hash read its bytes a second time.
     */
    private static Path copyOfStandardInput() {
        try {
            Path copy = Files.createTempFile("plumb-stdin-", ".model");
            copy.toFile().deleteOnExit();
            try (OutputStream out = Files.newOutputStream(copy)) {
                byte[] buf = new byte[1 << 16];
                long total = 0;
                for (int n; (n = System.in.read(buf)) > 0; ) {
                    total += n;
                    if (total > ModelReader.MAX_BYTES) {
                        throw new ModelException(STDIN_NAME, "", "larger than %d bytes, refused", ModelReader.MAX_BYTES);
                    }
                    out.write(buf, 0, n);
                }
            }
            return copy;
        } catch (IOException e) {
            throw new ModelException(STDIN_NAME, "", "cannot read: %s", Outputs.cause(e));
        }
    }
}
