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
            StructType first = null;
            String firstFile = null;
            for (String f : files) {
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
            return new Read(spark.read().parquet(files.toArray(String[]::new)), parquetFiles(spark, files));
        } catch (InputException e) {
            throw e;
        } catch (Exception e) {
            throw new InputException(specFile + ": " + events.path() + ": Spark: " + EventBuild.firstLine(e));
        }
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
