package plumb.cli;

import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;
import plumb.cli.plot.FigureFiles;
import plumb.cli.plot.FigureWriter;
import plumb.cli.plot.TemplateFigure;
import plumb.engine.tooling.Templates;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import java.util.stream.Stream;

/** {@code plumb templates MODEL --out DIR}: nominal, up and down of every variation, PNG and SVG. */
@Command(name = "templates", mixinStandardHelpOptions = true,
        description = "Draw every variation of every sample: nominal, up and down, with a ratio panel to nominal (PNG and SVG).")
final class TemplatesCommand implements Callable<Integer> {

    @Mixin ModelInput input;

    @Option(names = "--out", required = true, paramLabel = "DIR", description = "Folder for the figures (created when missing).")
    Path out;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        List<Templates.Template> all = Templates.of(input.load().model());
        List<FigureFiles> files = write(all, out);
        spec.commandLine().getOut().printf("wrote %d template figures (PNG and SVG) to %s%n", files.size(), out);
        spec.commandLine().getOut().flush();
        return ExitCodes.OK;
    }

    /** The file name (no extension) of template number {@code k}: numbered, so that names never collide. */
    static String fileName(int k, Templates.Template t) {
        return String.format(Locale.ROOT, "template-%03d-%s", k,
                FigureWriter.safeName(t.channel() + "_" + t.sample() + "_" + t.parameter()));
    }

    /**
     * Draws every template into a staging folder inside {@code dir}, then moves the files into
     * {@code dir}: a failure leaves no figure behind.
     */
    static List<FigureFiles> write(List<Templates.Template> all, Path dir) {
        Path staging = null;
        try {
            Files.createDirectories(dir);
            staging = Files.createTempDirectory(dir, ".templates-");
            List<FigureFiles> staged = new ArrayList<>();
            for (int k = 0; k < all.size(); k++) staged.add(TemplateFigure.of(all.get(k)).write(staging, fileName(k, all.get(k))));
            List<FigureFiles> done = new ArrayList<>();
            for (FigureFiles f : staged) {
                Path png = Files.move(f.png(), dir.resolve(f.png().getFileName()), StandardCopyOption.REPLACE_EXISTING);
                Path svg = Files.move(f.svg(), dir.resolve(f.svg().getFileName()), StandardCopyOption.REPLACE_EXISTING);
                done.add(new FigureFiles(f.name(), png, svg, f.width(), f.height()));
            }
            return done;
        } catch (IOException | RuntimeException e) {
            throw new InputException("cannot write --out " + dir + ": " + e.getMessage());
        } finally {
            if (staging != null) deleteTree(staging);
        }
    }

    private static void deleteTree(Path p) {
        try (Stream<Path> s = Files.walk(p)) {
            s.sorted(Comparator.reverseOrder()).forEach(x -> x.toFile().delete());
        } catch (IOException ignored) {
            // best effort: a leftover hidden staging folder holds no result
        }
    }
}
