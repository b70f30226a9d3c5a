package plumb.spark.build;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.parquet.hadoop.ParquetFileReader;
import org.apache.parquet.hadoop.metadata.BlockMetaData;
import org.apache.parquet.hadoop.metadata.ColumnChunkMetaData;
import org.apache.parquet.hadoop.util.HadoopInputFile;

import java.io.IOException;
import java.io.Serializable;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.stream.Collectors;

/**
 * How the Parquet passes of a build are cut into Spark tasks. The unit is the row group (the
 * smallest part of a file a reader can start at); a task takes consecutive row groups of one
 * pass's files, in order, until the bytes of the columns it reads would pass
 * {@link #TASK_BYTES}. So a big file is shared by several tasks, small files are read several to
 * a task (fewer tallies for the driver to add), and the cut depends on the files alone: the same
 * tasks, hence the same sums, on any number of cores.
 */
final class TaskPlan {

    /** Bytes of the columns read per task: Spark's own default size of a file partition. */
    static final long TASK_BYTES = 128L << 20;

    private TaskPlan() {
    }

    /**
     * Bytes {@code [start, end)} of a file: Parquet's reader takes the row groups whose middle
     * lies in it, so a range that spans whole row groups reads exactly those.
     */
    record Range(String file, long start, long end) implements Serializable {
    }

    /** The work of one task: ranges of the files of pass {@code pass}, summed in this order. */
    record Task(int pass, Range[] ranges) implements Serializable {
    }

    /** One row group: its bytes in the file, and how many of them the pass reads. */
    record Group(long start, long end, long bytesRead) {
    }

    /** The tasks of all passes, pass after pass, each pass's files in order, {@code limit} bytes read per task. */
    static List<Task> tasks(Configuration conf, List<ParquetPass.Input> inputs, long limit) throws IOException {
        Map<String, List<BlockMetaData>> footers = new HashMap<>();
        List<Task> out = new ArrayList<>();
        for (int pass = 0; pass < inputs.size(); pass++) {
            ParquetPass.Input in = inputs.get(pass);
            Set<String> read = new java.util.HashSet<>();
            for (BatchExpr.Column c : in.program().columns()) read.add(c.name.toLowerCase(Locale.ROOT));
            List<List<Group>> groups = new ArrayList<>();
            for (String f : in.files()) {
                List<BlockMetaData> blocks = footers.get(f);
                if (blocks == null) {
                    try (ParquetFileReader r = ParquetFileReader.open(HadoopInputFile.fromPath(new Path(f), conf))) {
                        blocks = r.getFooter().getBlocks();
                    }
                    footers.put(f, blocks);
                }
                groups.add(blocks.stream().map(b -> group(b, read)).collect(Collectors.toList()));
            }
            out.addAll(cut(pass, in.files(), groups, limit));
        }
        return out;
    }

    private static Group group(BlockMetaData b, Set<String> read) {
        long bytes = 0;
        for (ColumnChunkMetaData c : b.getColumns()) {
            if (read.contains(c.getPath().toArray()[0].toLowerCase(Locale.ROOT))) bytes += c.getTotalSize();
        }
        return new Group(b.getStartingPos(), b.getStartingPos() + b.getCompressedSize(), bytes);
    }

    /**
     * Cuts one pass: row groups in file order, a new task when the next group would take the
     * current one past {@code limit} bytes read (a group larger than that is a task of its own);
     * consecutive groups of one file in a task make one range.
     */
    static List<Task> cut(int pass, List<String> files, List<List<Group>> groups, long limit) {
        List<Task> out = new ArrayList<>();
        List<Range> ranges = new ArrayList<>();
        long bytes = 0;
        for (int f = 0; f < files.size(); f++) {
            for (Group g : groups.get(f)) {
                if (!ranges.isEmpty() && bytes + g.bytesRead() > limit) {
                    out.add(new Task(pass, ranges.toArray(Range[]::new)));
                    ranges.clear();
                    bytes = 0;
                }
                Range last = ranges.isEmpty() ? null : ranges.get(ranges.size() - 1);
                if (last != null && last.file().equals(files.get(f)) && last.end() == g.start()) {
                    ranges.set(ranges.size() - 1, new Range(last.file(), last.start(), g.end()));
                } else {
                    ranges.add(new Range(files.get(f), g.start(), g.end()));
                }
                bytes += g.bytesRead();
            }
        }
        if (!ranges.isEmpty()) out.add(new Task(pass, ranges.toArray(Range[]::new)));
        return out;
    }
}
