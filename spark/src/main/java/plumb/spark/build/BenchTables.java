package plumb.spark.build;

import org.apache.hadoop.conf.Configuration;
import org.apache.parquet.hadoop.ParquetWriter;
import org.apache.parquet.hadoop.api.WriteSupport;
import org.apache.parquet.hadoop.metadata.CompressionCodecName;
import org.apache.parquet.io.LocalOutputFile;
import org.apache.parquet.io.OutputFile;
import org.apache.parquet.io.api.RecordConsumer;
import org.apache.parquet.schema.MessageType;
import org.apache.parquet.schema.PrimitiveType.PrimitiveTypeName;
import org.apache.parquet.schema.Type.Repetition;
import org.apache.parquet.schema.Types;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

/**
 * The generated event tables of the build benchmark ({@link BuildSpeed}): {@code samples}
 * folders {@code s0 … s9} of Parquet files with the columns m (the observable), n_ph (an int),
 * iso, w (the nominal weight) and wv0 … wv19 (one weight column per variation).
 *
 * <p>Written from plain Java with Parquet's own writer, one file per task on every core: no Spark,
 * whose generation through SQL ({@code range} and {@code rand}) took 506 s of wall time for 10⁷
 * events on the loaded 2-core machine; this writer needs ~2.5 CPU-µs per event. Every file's numbers
 * follow from the seed, its sample and its position alone (a random stream of its own), so a
 * dataset is the same whatever the number of threads, and the in-memory bound can take exactly
 * the events of sample 0.
 *
 * <p>Neither dictionaries nor compression: the doubles are random to the last bit of the
 * mantissa, so no value repeats (a dictionary is tried and dropped per column chunk) and a
 * compressor finds next to nothing to remove (Snappy: 185.6 instead of 188.1 MB for 10⁶ events);
 * it would only cost CPU when writing and when reading.
 *
 * <p>A manifest written last ({@value #MANIFEST}) lists the parameters and every file with its
 * size: a folder whose manifest matches is used as it is, anything else is generated again (a
 * run stopped half-way is resumed: {@link #ensure}).
 */
final class BenchTables {

    static final String MANIFEST = "tables-manifest.txt";
    /** Present while a dataset is being written: its header. */
    static final String UNDERWAY = "tables-underway.txt";
    /** Changes whenever the numbers generated for the same parameters change. */
    static final int GENERATOR_VERSION = 1;
    /**
     * Events per file at most: ~47 MB, one row group (Parquet's default row group is 128 MB). The
     * build reads a file per task: 10⁷ events make 4 files a sample, 10⁸ events 40, so both cores
     * have work in every sample's pass; Spark's own scan packs several such files into a task.
     */
    static final long EVENTS_PER_FILE = 250_000;

    final long events;
    final int samples;
    final int variations;
    final long seed;
    final long eventsPerFile;

    BenchTables(long events, int samples, int variations, long seed) {
        this(events, samples, variations, seed, EVENTS_PER_FILE);
    }

    BenchTables(long events, int samples, int variations, long seed, long eventsPerFile) {
        if (events < samples) throw new IllegalArgumentException("fewer events (" + events + ") than samples (" + samples + ")");
        this.events = events;
        this.samples = samples;
        this.variations = variations;
        this.seed = seed;
        this.eventsPerFile = eventsPerFile;
    }

    /** Events of sample {@code s}: an even share, the first samples take the remainder. */
    long sampleEvents(int s) {
        return events / samples + (s < events % samples ? 1 : 0);
    }

    int files(int s) {
        return (int) Math.max(1, (sampleEvents(s) + eventsPerFile - 1) / eventsPerFile);
    }

    /** Events of file {@code f} of sample {@code s}: an even share of the sample's. */
    int fileEvents(int s, int f) {
        long n = sampleEvents(s);
        int k = files(s);
        return Math.toIntExact(n / k + (f < n % k ? 1 : 0));
    }

    static Path file(Path dir, int s, int f) {
        return dir.resolve("s" + s).resolve(String.format(java.util.Locale.ROOT, "part-%04d.parquet", f));
    }

    /** The columns in file order. */
    List<String> columns() {
        List<String> c = new ArrayList<>(List.of("m", "n_ph", "iso", "w"));
        for (int v = 0; v < variations; v++) c.add("wv" + v);
        return c;
    }

    /** The header of the manifest: everything the numbers depend on. */
    String header() {
        return "plumb build-speed event tables\ngenerator " + GENERATOR_VERSION + "\nevents " + events + "\nsamples " + samples
                + "\nvariations " + variations + "\nevents per file " + eventsPerFile + "\nseed " + seed + "\ncolumns " + String.join(" ", columns()) + "\n";
    }

    /** True when {@code dir} holds this dataset complete: the manifest matches and every file has its size. */
    boolean present(Path dir) {
        Path manifest = dir.resolve(MANIFEST);
        if (!Files.isRegularFile(manifest)) return false;
        try {
            String text = Files.readString(manifest);
            if (!text.startsWith(header())) return false;
            Map<String, Long> sizes = new HashMap<>();
            for (String line : text.substring(header().length()).split("\n")) {
                if (line.isBlank()) continue;
                int space = line.lastIndexOf(' ');
                sizes.put(line.substring(0, space), Long.parseLong(line.substring(space + 1)));
            }
            int count = 0;
            for (int s = 0; s < samples; s++) {
                for (int f = 0; f < files(s); f++) {
                    Path p = file(dir, s, f);
                    Long size = sizes.get(dir.relativize(p).toString());
                    if (size == null || !Files.isRegularFile(p) || Files.size(p) != size) return false;
                    count++;
                }
            }
            return count == sizes.size();
        } catch (IOException | RuntimeException e) {
            return false;
        }
    }

    /**
     * Makes {@code dir} hold this dataset: nothing to do when it is there already. Otherwise the
     * files are written on {@code threads} threads, after a marker with the header
     * ({@value #UNDERWAY}): a run that stops half-way leaves it, and the next run with the same
     * parameters keeps the files already complete (a file gets its name only once written) and
     * writes the rest. Without a matching marker, the manifest and the Parquet files of earlier
     * datasets in the sample folders are removed first. True when files were written.
     */
    boolean ensure(Path dir, int threads) throws IOException {
        if (present(dir)) return false;
        Files.createDirectories(dir);
        Files.deleteIfExists(dir.resolve(MANIFEST));
        Path underway = dir.resolve(UNDERWAY);
        boolean resume = Files.isRegularFile(underway) && Files.readString(underway).equals(header());
        for (int s = 0; s < Math.max(samples, 64); s++) {
            Path folder = dir.resolve("s" + s);
            if (!Files.isDirectory(folder)) continue;
            try (DirectoryStream<Path> old = Files.newDirectoryStream(folder, "{part-*.parquet,.part-*.writing}")) {
                for (Path p : old) {
                    boolean keep = resume && s < samples && p.getFileName().toString().startsWith("part-")
                            && isFileOfThisDataset(dir, s, p);
                    if (!keep) Files.delete(p);
                }
            }
        }
        Files.writeString(underway, header());
        List<int[]> jobs = new ArrayList<>(), missing = new ArrayList<>();
        for (int s = 0; s < samples; s++) {
            Files.createDirectories(dir.resolve("s" + s));
            for (int f = 0; f < files(s); f++) {
                jobs.add(new int[] {s, f});
                if (!Files.isRegularFile(file(dir, s, f))) missing.add(new int[] {s, f});
            }
        }
        ExecutorService pool = Executors.newFixedThreadPool(Math.max(1, threads));
        try {
            List<Future<?>> done = new ArrayList<>();
            for (int[] j : missing) done.add(pool.submit(() -> write(dir, j[0], j[1], CompressionCodecName.UNCOMPRESSED)));
            for (Future<?> d : done) d.get();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IOException("interrupted while writing the tables");
        } catch (java.util.concurrent.ExecutionException e) {
            throw e.getCause() instanceof UncheckedIOException u ? u.getCause() : new IOException(e.getCause());
        } finally {
            pool.shutdownNow();
        }
        StringBuilder m = new StringBuilder(header());
        for (int[] j : jobs) {
            Path p = file(dir, j[0], j[1]);
            m.append(dir.relativize(p)).append(' ').append(Files.size(p)).append('\n');
        }
        Path tmp = dir.resolve("." + MANIFEST + ".writing");
        Files.writeString(tmp, m);
        Files.move(tmp, dir.resolve(MANIFEST), StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
        Files.delete(underway);
        return true;
    }

    private boolean isFileOfThisDataset(Path dir, int s, Path p) {
        for (int f = 0; f < files(s); f++) if (file(dir, s, f).equals(p)) return true;
        return false;
    }

    /** Writes file {@code f} of sample {@code s} under a hidden name, then renames it. */
    Path write(Path dir, int s, int f, CompressionCodecName codec) {
        Path target = file(dir, s, f);
        Path tmp = target.resolveSibling("." + target.getFileName() + ".writing");
        try {
            Files.deleteIfExists(tmp);
            Events source = events(s, f);
            double[] row = new double[4 + variations];
            try (ParquetWriter<double[]> w = new Writer(new LocalOutputFile(tmp), schema()).withCompressionCodec(codec)
                    .withDictionaryEncoding(false).withPageWriteChecksumEnabled(false).build()) {
                for (int i = fileEvents(s, f); i > 0; i--) {
                    source.next(row);
                    w.write(row);
                }
            }
            Files.move(tmp, target, StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
            return target;
        } catch (IOException e) {
            throw new UncheckedIOException(tmp + ": " + e.getMessage(), e);
        }
    }

    /** The random stream of file {@code f} of sample {@code s}. */
    Events events(int s, int f) {
        // SplittableRandom mixes the seed: neighbouring seeds give unrelated streams
        return new Events(new SplittableRandom(seed * 1_000_003L + s * 65_537L + f), variations);
    }

    /** The events of one file in order, as rows {m, n_ph, iso, w, wv0, …}. */
    static final class Events {
        private final SplittableRandom rng;
        private final int variations;

        Events(SplittableRandom rng, int variations) {
            this.rng = rng;
            this.variations = variations;
        }

        void next(double[] row) {
            row[0] = rng.nextDouble() * 1000;                 // m: flat over the 20 bins of 0 … 1000
            row[1] = rng.nextInt(4);                          // n_ph: 0 … 3, half the events pass n_ph >= 2
            row[2] = rng.nextDouble();                        // iso
            double w = 0.5 + rng.nextDouble();
            row[3] = w;
            for (int v = 0; v < variations; v++) row[4 + v] = w * (0.9 + 0.2 * rng.nextDouble());
        }
    }

    MessageType schema() {
        // optional (nullable) columns, as Spark writes them: the reader pays for the definition levels as it would on real tables
        Types.MessageTypeBuilder b = Types.buildMessage();
        b.optional(PrimitiveTypeName.DOUBLE).named("m");
        b.optional(PrimitiveTypeName.INT32).named("n_ph");
        b.optional(PrimitiveTypeName.DOUBLE).named("iso");
        b.optional(PrimitiveTypeName.DOUBLE).named("w");
        for (int v = 0; v < variations; v++) b.addField(Types.primitive(PrimitiveTypeName.DOUBLE, Repetition.OPTIONAL).named("wv" + v));
        return b.named("events");
    }

    /** Parquet's writer for rows of doubles (n_ph, the second, written as an int). */
    private static final class Writer extends ParquetWriter.Builder<double[], Writer> {
        private final MessageType schema;

        Writer(OutputFile file, MessageType schema) {
            super(file);
            this.schema = schema;
        }

        @Override
        protected Writer self() {
            return this;
        }

        @Override
        protected WriteSupport<double[]> getWriteSupport(Configuration conf) {
            return new RowWrite(schema);
        }
    }

    private static final class RowWrite extends WriteSupport<double[]> {
        private final MessageType schema;
        private final String[] names;
        private RecordConsumer out;

        RowWrite(MessageType schema) {
            this.schema = schema;
            this.names = schema.getFields().stream().map(org.apache.parquet.schema.Type::getName).toArray(String[]::new);
        }

        @Override
        public WriteContext init(Configuration configuration) {
            return new WriteContext(schema, Map.of());
        }

        @Override
        public void prepareForWrite(RecordConsumer recordConsumer) {
            out = recordConsumer;
        }

        @Override
        public void write(double[] row) {
            out.startMessage();
            for (int i = 0; i < names.length; i++) {
                out.startField(names[i], i);
                if (i == 1) out.addInteger((int) row[i]);
                else out.addDouble(row[i]);
                out.endField(names[i], i);
            }
            out.endMessage();
        }
    }
}
