package plumb.spark.build;

import org.apache.spark.sql.Row;
import org.apache.spark.sql.RowFactory;
import org.apache.spark.sql.SaveMode;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.sql.types.DataTypes;
import org.apache.spark.sql.types.StructField;
import org.apache.spark.sql.types.StructType;
import plumb.cli.InputException;
import plumb.cli.build.BuildOutcome;
import plumb.cli.io.AtomicFiles;
import plumb.spark.campaign.SparkRunner;

import java.io.IOException;
import java.io.InputStream;
import java.io.PrintWriter;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.stream.Stream;

/**
 * {@code plumb demo --events [DIR]}: invented event tables of the two-photon resonance scenario
 * ({@link DemoEvents}) written as Parquet into DIR/events, the build description of the demo
 * copied to DIR/build.json, and the model built from them exactly as {@code plumb build} does
 * (DIR/model.json and its cut flow). The command line then runs the report on the model.
 */
public final class EventsDemo {

    /** The demo's build description (also the worked example of docs/build-format.md). */
    static final String SPEC_RESOURCE = "events-demo.json";

    private EventsDemo() {
    }

    /** Opens Spark on {@code master}, writes the tables and the description, builds; Spark is closed on return. */
    // "try": the runner is opened for the Spark context it starts, which the session below uses,
    // and is closed at the end of the block; the body need not name it
    @SuppressWarnings("try")
    public static BuildOutcome run(Path dir, String master, int timeoutSeconds, long seed, PrintWriter out, PrintWriter err) {
        if (Files.exists(dir) && !Files.isDirectory(dir)) {
            throw new InputException("--events " + dir + ": exists and is not a folder");
        }
        err.printf(Locale.ROOT, "demo: starting Spark (%s)%n", master);
        err.flush();
        try (SparkRunner runner = SparkRunner.open(master, timeoutSeconds)) {
            SparkSession spark = SparkSession.builder().getOrCreate();
            Path spec = write(spark, dir, seed, out);
            return EventBuild.build(BuildSpecReader.read(spec), spark, dir.resolve("model.json"), out, err);
        }
    }

    /** Writes DIR/events/*.parquet and DIR/build.json; the description's path. */
    static Path write(SparkSession spark, Path dir, long seed, PrintWriter out) {
        Path events = dir.resolve("events");
        try {
            Files.createDirectories(events);
            for (DemoEvents.Process p : DemoEvents.PROCESSES) {
                List<Object[]> rows = DemoEvents.simulated(p, seed);
                writeParquet(spark, DemoEvents.MC_COLUMNS, rows, events.resolve(p.name() + ".parquet"));
                out.printf(Locale.ROOT, "  events: %-11s %6d simulated events, %7.1f expected before selection%n",
                        p.name(), rows.size(), p.expected());
            }
            List<Object[]> data = DemoEvents.pseudoData(seed);
            writeParquet(spark, DemoEvents.DATA_COLUMNS, data, events.resolve("data.parquet"));
            out.printf(Locale.ROOT, "  events: %-11s %6d pseudo-data events drawn from the sum (seed %d)%n", "data", data.size(), seed);
            Path spec = dir.resolve("build.json");
            byte[] text;
            try (InputStream in = EventsDemo.class.getResourceAsStream(SPEC_RESOURCE)) {
                if (in == null) throw new IllegalStateException("resource " + SPEC_RESOURCE + " missing from the spark module");
                text = in.readAllBytes();
            }
            AtomicFiles.write(spec, o -> o.write(text));
            out.printf(Locale.ROOT, "wrote the event tables to %s and the build description %s%n", events, spec);
            out.flush();
            return spec;
        } catch (IOException | UncheckedIOException e) {
            throw new InputException("--events " + dir + ": cannot write: " + EventBuild.firstLine(e));
        }
    }

    /** The Spark type of each column: integers for the counts, doubles for the rest. */
    static StructType schema(List<String> columns) {
        List<StructField> fields = new ArrayList<>();
        for (String c : columns) {
            fields.add(DataTypes.createStructField(c, DemoEvents.INTEGER_COLUMNS.contains(c)
                    ? DataTypes.IntegerType : DataTypes.DoubleType, false));
        }
        return DataTypes.createStructType(fields);
    }

    /**
     * One Parquet file at {@code target}: Spark writes a folder of parts beside it, its single part
     * is moved into place in one step (so a reader never sees half a file) and the folder removed.
     */
    static void writeParquet(SparkSession spark, List<String> columns, List<Object[]> rows, Path target) throws IOException {
        List<Row> sparkRows = new ArrayList<>(rows.size());
        for (Object[] r : rows) sparkRows.add(RowFactory.create(r));
        Path parts = target.resolveSibling("." + target.getFileName() + ".parts");
        try {
            spark.createDataFrame(sparkRows, schema(columns)).coalesce(1).write().mode(SaveMode.Overwrite)
                    .parquet(parts.toString());
            List<Path> written;
            try (Stream<Path> s = Files.list(parts)) {
                written = s.filter(f -> f.getFileName().toString().startsWith("part-")
                        && f.getFileName().toString().endsWith(".parquet")).toList();
            }
            if (written.size() != 1) throw new IOException(parts + ": expected one Parquet part, found " + written.size());
            Files.move(written.get(0), target, StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
        } finally {
            deleteTree(parts);
        }
    }

    private static void deleteTree(Path dir) throws IOException {
        if (!Files.exists(dir)) return;
        try (Stream<Path> s = Files.walk(dir)) {
            for (Path p : s.sorted(Comparator.reverseOrder()).toList()) Files.deleteIfExists(p);
        }
    }
}
