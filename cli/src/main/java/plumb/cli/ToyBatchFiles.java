package plumb.cli;

import plumb.cli.io.AtomicFiles;
import plumb.engine.inference.InjectionToyBatch;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

/**
 * Part files of injection runs on disk: the thin file layer over the engine's
 * {@link InjectionToyBatch}, which holds the format and the merge rules. Errors name the file and
 * the JSON path (exit status 2); a part is written whole or not at all.
 */
final class ToyBatchFiles {

    private ToyBatchFiles() {
    }

    /** Writes {@code batch} to {@code target}, or to {@code out} when target is "-". */
    static void write(InjectionToyBatch batch, String target, PrintWriter out) {
        try {
            if ("-".equals(target)) {
                ByteArrayOutputStream buffer = new ByteArrayOutputStream();
                batch.write(buffer);
                out.print(buffer.toString(StandardCharsets.UTF_8));
                out.flush();
            } else {
                AtomicFiles.write(Path.of(target), batch::write);
            }
        } catch (IOException | RuntimeException e) {
            throw Outputs.cannotWrite(target, e);
        }
    }

    /** Reads a part file. */
    static InjectionToyBatch read(Path file) {
        try (InputStream in = Files.newInputStream(file)) {
            return InjectionToyBatch.read(in, file.toString());
        } catch (java.nio.file.NoSuchFileException e) {
            throw new InputException(file + ": no such file");
        } catch (InjectionToyBatch.BadBatch e) {
            throw new InputException(e.getMessage());
        } catch (IOException e) {
            throw new InputException(file + ": cannot read a toy batch: " + String.valueOf(e.getMessage()).lines().findFirst().orElse(""));
        }
    }

    /** Reads and merges part files (the engine's rules: one run, no overlap, no gap). */
    static InjectionToyBatch merge(List<Path> files) {
        List<InjectionToyBatch> parts = new ArrayList<>();
        List<String> names = new ArrayList<>();
        for (Path f : files) {
            parts.add(read(f));
            names.add(f.toString());
        }
        try {
            return InjectionToyBatch.merge(parts, names);
        } catch (InjectionToyBatch.BadBatch e) {
            throw new InputException(e.getMessage());
        }
    }
}
