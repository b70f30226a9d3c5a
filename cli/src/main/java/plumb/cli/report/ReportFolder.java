package plumb.cli.report;

import plumb.cli.io.AtomicFiles;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collection;
import java.util.Comparator;
import java.util.List;
import java.util.Set;
import java.util.concurrent.ThreadLocalRandom;
import java.util.stream.Collectors;
import java.util.stream.Stream;

/**
 * The folder a report is written to, and the rules for reusing one.
 *
 * <p>A report is built in a staging folder {@code DIR.tmp-*} beside DIR, then put in place:
 * <ul>
 *   <li>DIR missing: the staging folder is renamed to DIR in one step;</li>
 *   <li>DIR holds a previous report (it has the {@link #MARKER} file every report writes), is
 *       empty, or holds only the run's own input models: DIR is renamed aside to another
 *       {@code DIR.tmp-*}, the staging folder renamed to DIR, and the old folder removed. Nothing
 *       of the previous report is left beside the new one; the input models found in DIR are
 *       carried over into the new folder;</li>
 *   <li>DIR holds anything else: refused, before any work, so no file of the user's is lost.</li>
 * </ul>
 * A failure before the swap leaves DIR as it was. Staging folders left by a killed run are
 * removed by the next run for the same DIR; SIGINT and SIGTERM remove them at once (a shutdown hook).
 */
public final class ReportFolder {

    /** The file that marks a folder as a Plumb report, so a later report may replace it. */
    public static final String MARKER = ".plumb-report";

    /** Marks a staging folder of report DIR: {@code DIR.tmp-<random>}. */
    static final String STAGE_MARK = ".tmp-";

    private ReportFolder() {
    }

    /** Thrown when DIR cannot take a report; the one-line message says what is in the way (callers put "--out DIR: " before it). */
    public static final class NotReusable extends IOException {
        private static final long serialVersionUID = 1L;

        NotReusable(String message) {
            super(message);
        }
    }

    /**
     * Checks that {@code dir} may receive a report: missing, empty, a previous report, or holding
     * only files among {@code inputs}. Run it before any computation, so a refusal costs nothing.
     */
    public static void requireReusable(Path dir, Collection<Path> inputs) throws IOException {
        Path target = target(dir);
        if (!Files.exists(target, LinkOption.NOFOLLOW_LINKS) && !Files.exists(target)) return;
        if (!Files.isDirectory(target)) throw new NotReusable("exists and is not a folder");
        if (Files.exists(target.resolve(MARKER), LinkOption.NOFOLLOW_LINKS)) return;
        List<String> foreign = foreignEntries(target, inputs);
        if (!foreign.isEmpty()) {
            throw new NotReusable("is not empty and holds no earlier report (no " + MARKER + " file): it has "
                    + String.join(", ", foreign.subList(0, Math.min(3, foreign.size())))
                    + (foreign.size() > 3 ? " and " + (foreign.size() - 3) + " more" : "")
                    + "; give a new or empty folder, or remove these files");
        }
    }

    /** DIR as an absolute path, a link to a folder resolved (the folder is replaced, the link kept). */
    static Path target(Path dir) throws IOException {
        Path target = dir.toAbsolutePath().normalize();
        if (Files.isDirectory(target)) target = target.toRealPath();
        if (target.getParent() == null) throw new NotReusable("is the root folder; give a folder of its own for the report");
        return target;
    }

    /** Entries of {@code folder} (names, sorted) that are not among the input files. */
    private static List<String> foreignEntries(Path folder, Collection<Path> inputs) throws IOException {
        Set<Path> own = realPaths(inputs);
        try (Stream<Path> entries = Files.list(folder)) {
            return entries.filter(p -> !own.contains(real(p))).map(p -> p.getFileName().toString()).sorted()
                    .collect(Collectors.toList());
        }
    }

    private static Set<Path> realPaths(Collection<Path> files) {
        return files.stream().filter(f -> !"-".equals(f.toString())).map(ReportFolder::real).collect(Collectors.toSet());
    }

    private static Path real(Path p) {
        try {
            return p.toRealPath(LinkOption.NOFOLLOW_LINKS);
        } catch (IOException | RuntimeException e) {
            return p.toAbsolutePath().normalize();
        }
    }

    /** A new staging folder beside the target, with the permissions the umask allows (unlike createTempDirectory's 0700). */
    static Path createStage(Path target) throws IOException {
        ThreadLocalRandom r = ThreadLocalRandom.current();
        for (int attempt = 0; ; attempt++) {
            Path stage = target.resolveSibling(target.getFileName() + STAGE_MARK + Long.toUnsignedString(r.nextLong(), 36));
            try {
                return Files.createDirectory(stage);
            } catch (java.nio.file.FileAlreadyExistsException taken) {
                if (attempt > 100) throw taken;
            }
        }
    }

    /** Set when the process is stopping (SIGINT, SIGTERM): a report being written stops before its next file. */
    private static volatile boolean stopping;

    static void checkRunning() throws IOException {
        if (stopping) throw new IOException("stopped by a signal");
    }

    /**
     * The shutdown hook's work: removes the staging folder (null: none yet). The writing thread
     * runs on while hooks run and may finish the file it is writing, so the folder is deleted
     * until it stays gone (at most a few seconds; the next run sweeps anything left).
     */
    static void removeWhileStopping(Path stage) {
        stopping = true;
        if (stage == null) return;
        long end = System.nanoTime() + 3_000_000_000L;
        for (int absent = 0; absent < 3 && System.nanoTime() < end; ) {
            try {
                deleteTree(stage);
            } catch (IOException | RuntimeException busy) {
                // a file appeared meanwhile: try again
            }
            absent = Files.exists(stage, LinkOption.NOFOLLOW_LINKS) ? 0 : absent + 1;
            try {
                Thread.sleep(20);
            } catch (InterruptedException e) {
                return;
            }
        }
    }

    /** Writes the marker into a staging folder. */
    static void mark(Path stage) throws IOException {
        AtomicFiles.writeString(stage.resolve(MARKER),
                "This folder is a Plumb report. A new report written here replaces everything in it.\n");
    }

    /**
     * Puts the finished staging folder in place of {@code target} (see the class comment); input
     * models inside the target are copied into the staging folder first.
     */
    static void publish(Path stage, Path target, Collection<Path> inputs) throws IOException {
        if (!Files.exists(target, LinkOption.NOFOLLOW_LINKS)) {
            try {
                AtomicFiles.move(stage, target);
                return;
            } catch (IOException raced) {
                if (!Files.isDirectory(target)) throw raced;   // created meanwhile: checked and swapped below
            }
        }
        requireReusable(target, inputs);
        carryOverInputs(target, stage, inputs);
        Path old = createStage(target);
        Files.delete(old);
        Files.move(target, old, java.nio.file.StandardCopyOption.ATOMIC_MOVE);
        try {
            Files.move(stage, target, java.nio.file.StandardCopyOption.ATOMIC_MOVE);
        } catch (IOException e) {
            Files.move(old, target, java.nio.file.StandardCopyOption.ATOMIC_MOVE);
            throw e;
        }
        deleteTree(old);
    }

    private static void carryOverInputs(Path target, Path stage, Collection<Path> inputs) throws IOException {
        Set<Path> own = realPaths(inputs);
        List<Path> found = new ArrayList<>();
        try (Stream<Path> entries = Files.list(target)) {
            entries.filter(p -> own.contains(real(p)) && Files.isRegularFile(p, LinkOption.NOFOLLOW_LINKS)).forEach(found::add);
        }
        for (Path f : found) {
            Path dest = stage.resolve(f.getFileName().toString());
            if (!Files.exists(dest, LinkOption.NOFOLLOW_LINKS)) Files.copy(f, dest, java.nio.file.StandardCopyOption.COPY_ATTRIBUTES);
        }
    }

    /** Staging folders of the same target left by a run that was killed (SIGKILL, power loss): removed. */
    static void sweepStale(Path target) {
        String prefix = target.getFileName() + STAGE_MARK;
        try (Stream<Path> siblings = Files.list(target.getParent())) {
            for (Path p : siblings.filter(p -> p.getFileName().toString().startsWith(prefix)
                    && Files.isDirectory(p, LinkOption.NOFOLLOW_LINKS)).toList()) {
                deleteTree(p);
            }
        } catch (IOException | RuntimeException e) {
            // a folder that cannot be swept does not stop the new report
        }
    }

    static void deleteTree(Path root) throws IOException {
        if (!Files.exists(root, LinkOption.NOFOLLOW_LINKS)) return;
        try (Stream<Path> walk = Files.walk(root)) {
            for (Path p : walk.sorted(Comparator.reverseOrder()).toList()) Files.deleteIfExists(p);
        }
    }
}
