package plumb.spark.build;

import org.apache.hadoop.fs.FileStatus;
import org.apache.hadoop.fs.FileSystem;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.sql.types.StructField;
import org.apache.spark.sql.types.StructType;
import plumb.cli.InputException;
import plumb.spark.build.BuildSpec.Events;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

/**
 * Reads one list of event tables (files or globs; Parquet, or CSV with a header line) into one
 * Spark table. Globs are expanded first so that a list matching nothing is an error naming its key,
 * and every Parquet file's columns are compared with the first's so that tables of one list with
 * different column types are refused before any event is read.
 */
final class EventTables {

    private EventTables() {
    }

    /** The table, and its files when they are Parquet (null for CSV). */
    record Read(Dataset<Row> table, List<String> parquetFiles) { }

    static Read read(SparkSession spark, Events events, Path specFile) {
        List<String> files = new ArrayList<>();
        for (String p : events.paths()) {
            org.apache.hadoop.fs.Path hp = new org.apache.hadoop.fs.Path(p);
            FileStatus[] found;
            try {
                FileSystem fs = hp.getFileSystem(spark.sparkContext().hadoopConfiguration());
                found = fs.globStatus(hp);
            } catch (Exception e) {
                throw new InputException(specFile + ": " + events.path() + ": " + p + ": " + EventBuild.firstLine(e));
            }
            if (found == null || found.length == 0) {
                throw new InputException(specFile + ": " + events.path() + ": no file matches " + p);
            }
            for (FileStatus f : found) files.add(f.getPath().toString());
        }
        long csv = files.stream().filter(f -> f.toLowerCase(java.util.Locale.ROOT).endsWith(".csv")).count();
        if (csv != 0 && csv != files.size()) {
            throw new InputException(specFile + ": " + events.path() + ": mixes CSV and Parquet files");
        }
        try {
            if (csv > 0) {
                return new Read(spark.read().option("header", "true").option("inferSchema", "true").option("mode", "FAILFAST")
                        .csv(files.toArray(String[]::new)), null);
            }
            List<String> data = parquetFiles(spark, files);
            if (data != null && sameFooters(spark, data)) {
                return new Read(spark.read().parquet(files.toArray(String[]::new)), data);
            }
            StructType first = null;
            String firstFile = null;
            for (String f : files) {   // Spark's view of each file's columns names the difference
                StructType s = spark.read().parquet(f).schema();
                if (first == null) {
                    first = s;
                    firstFile = f;
                } else {
                    String diff = difference(first, s);
                    if (diff != null) {
                        throw new InputException(specFile + ": " + events.path() + ": " + f + " does not match " + firstFile
                                + ": " + diff);
                    }
                }
            }
            return new Read(spark.read().parquet(files.toArray(String[]::new)), data);
        } catch (InputException e) {
            throw e;
        } catch (Exception e) {
            throw new InputException(specFile + ": " + events.path() + ": Spark: " + EventBuild.firstLine(e));
        }
    }

    /**
     * Whether every file's Parquet schema (read from its footer, without Spark) equals the
     * first's: then Spark sees the same columns in all and need not resolve each file on its own,
     * which costs far more than reading a footer (the benchmark has a hundred files per sample).
     * False when they differ or a footer cannot be read: Spark then checks and names the problem.
     */
    private static boolean sameFooters(SparkSession spark, List<String> files) {
        org.apache.hadoop.conf.Configuration conf = spark.sparkContext().hadoopConfiguration();
        org.apache.parquet.schema.MessageType first = null;
        for (String f : files) {
            org.apache.parquet.schema.MessageType schema;
            try (org.apache.parquet.hadoop.ParquetFileReader r = org.apache.parquet.hadoop.ParquetFileReader.open(
                    org.apache.parquet.hadoop.util.HadoopInputFile.fromPath(new org.apache.hadoop.fs.Path(f), conf))) {
                schema = r.getFooter().getFileMetaData().getSchema();
            } catch (IOException | RuntimeException e) {
                return false;
            }
            if (first == null) first = schema;
            else if (!first.equals(schema)) return false;
        }
        return true;
    }

    /**
     * The data files Spark reads for the list: a folder stands for the files in it whose names
     * do not start with "_" or "." (Spark's rule); null when a folder holds another folder (Spark
     * would look for partitions there: its own reading handles that).
     */
    private static List<String> parquetFiles(SparkSession spark, List<String> files) throws IOException {
        List<String> out = new ArrayList<>();
        for (String f : files) {
            org.apache.hadoop.fs.Path p = new org.apache.hadoop.fs.Path(f);
            FileSystem fs = p.getFileSystem(spark.sparkContext().hadoopConfiguration());
            if (!fs.getFileStatus(p).isDirectory()) {
                out.add(f);
                continue;
            }
            FileStatus[] inside = fs.listStatus(p);
            java.util.Arrays.sort(inside);
            for (FileStatus s : inside) {
                String name = s.getPath().getName();
                if (name.startsWith("_") || name.startsWith(".")) continue;
                if (s.isDirectory()) return null;
                out.add(s.getPath().toString());
            }
        }
        return List.copyOf(out);
    }

    /** The first column whose presence or type differs, or null when the columns agree. */
    static String difference(StructType a, StructType b) {
        for (StructField f : a.fields()) {
            int i = b.getFieldIndex(f.name()).isDefined() ? (Integer) b.getFieldIndex(f.name()).get() : -1;
            if (i < 0) return "column " + f.name() + " is missing";
            String ta = f.dataType().simpleString(), tb = b.fields()[i].dataType().simpleString();
            if (!ta.equals(tb)) return "column " + f.name() + " is " + tb + ", not " + ta;
        }
        for (StructField f : b.fields()) {
            if (a.getFieldIndex(f.name()).isEmpty()) return "it has a column " + f.name() + " the other lacks";
        }
        return null;
    }
}
