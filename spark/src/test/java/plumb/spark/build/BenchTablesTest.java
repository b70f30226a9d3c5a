package plumb.spark.build;

import org.apache.parquet.example.data.Group;
import org.apache.parquet.hadoop.ParquetReader;
import org.apache.parquet.hadoop.example.GroupReadSupport;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The benchmark's tables: what is written, that it is the same on any number of threads, and when it is reused. */
class BenchTablesTest {

    @TempDir
    Path dir;

    /** Every value read back by Parquet's own reader equals the file's random stream. */
    @Test
    void filesHoldTheirStreamsEvents() throws IOException {
        BenchTables t = new BenchTables(2_501, 2, 3, 5);
        assertTrue(t.ensure(dir, 2));
        assertEquals(List.of("m", "n_ph", "iso", "w", "wv0", "wv1", "wv2"), t.columns());
        assertEquals(1_251, t.fileEvents(0, 0));   // the first sample takes the odd event
        assertEquals(1_250, t.fileEvents(1, 0));
        long total = 0;
        for (int s = 0; s < 2; s++) {
            List<double[]> rows = read(BenchTables.file(dir, s, 0), 7);
            BenchTables.Events e = t.events(s, 0);
            double[] expected = new double[7];
            for (double[] row : rows) {
                e.next(expected);
                assertArrayEquals(expected, row, 0.0);
                assertTrue(row[0] >= 0 && row[0] < 1000 && row[1] >= 0 && row[1] <= 3 && row[3] >= 0.5 && row[3] < 1.5);
                assertTrue(row[4] >= 0.9 * row[3] && row[4] <= 1.1 * row[3]);
            }
            total += rows.size();
        }
        assertEquals(2_501, total);
        double[] a = new double[7], b = new double[7];
        t.events(0, 0).next(a);
        t.events(1, 0).next(b);
        assertFalse(Arrays.equals(a, b), "each file has a stream of its own");
    }

    /** Files of at most so many events; the bytes do not depend on the number of threads. */
    @Test
    void sameBytesOnOneOrTwoThreads() throws IOException {
        BenchTables t = new BenchTables(410, 2, 2, 9, 200);   // 205 events a sample: 2 files each
        assertEquals(2, t.files(0));
        assertEquals(103, t.fileEvents(0, 0));
        assertEquals(102, t.fileEvents(0, 1));
        Path one = dir.resolve("one"), two = dir.resolve("two");
        t.ensure(one, 1);
        t.ensure(two, 2);
        for (int s = 0; s < 2; s++) {
            for (int f = 0; f < 2; f++) {
                assertArrayEquals(Files.readAllBytes(BenchTables.file(one, s, f)), Files.readAllBytes(BenchTables.file(two, s, f)));
            }
        }
        assertEquals(Files.readString(one.resolve(BenchTables.MANIFEST)), Files.readString(two.resolve(BenchTables.MANIFEST)));
    }

    /** A matching manifest skips the work; other parameters, a changed or a missing file write everything again. */
    @Test
    void reusedOnlyWhenTheManifestMatches() throws IOException {
        BenchTables t = new BenchTables(400, 2, 1, 3);
        assertFalse(t.present(dir));
        assertTrue(t.ensure(dir, 2));
        assertTrue(t.present(dir));
        assertFalse(t.ensure(dir, 2), "complete and matching: nothing written");

        BenchTables other = new BenchTables(400, 2, 1, 4);   // another seed
        assertFalse(other.present(dir));
        assertTrue(other.ensure(dir, 2));
        assertFalse(t.present(dir));

        Path f = BenchTables.file(dir, 1, 0);
        Files.writeString(f, "cut short");
        assertFalse(other.present(dir));
        assertTrue(other.ensure(dir, 2));
        assertEquals(200, read(f, 5).size());

        Files.delete(BenchTables.file(dir, 0, 0));
        assertFalse(other.present(dir));

        // a smaller dataset leaves no file of the larger one behind
        BenchTables fewer = new BenchTables(400, 1, 1, 4);
        assertTrue(fewer.ensure(dir, 2));
        assertTrue(fewer.present(dir));
        try (var left = Files.list(dir.resolve("s1"))) {
            assertNull(left.findAny().orElse(null));
        }
    }

    /** A run stopped half-way: the next keeps the complete files of the same parameters and writes the rest. */
    @Test
    void resumesAnInterruptedRun() throws IOException {
        BenchTables t = new BenchTables(600, 2, 1, 8, 100);   // 3 files a sample
        Path whole = dir.resolve("whole"), cut = dir.resolve("cut");
        t.ensure(whole, 2);
        assertTrue(t.ensure(cut, 2));
        // as if stopped after two files: the marker back, the manifest and the other files gone
        Files.writeString(cut.resolve(BenchTables.UNDERWAY), t.header());
        Files.delete(cut.resolve(BenchTables.MANIFEST));
        for (int s = 0; s < 2; s++) for (int f = 0; f < 3; f++) if (s == 1 || f > 1) Files.delete(BenchTables.file(cut, s, f));
        long kept = Files.getLastModifiedTime(BenchTables.file(cut, 0, 0)).toMillis();
        Files.setLastModifiedTime(BenchTables.file(cut, 0, 0), java.nio.file.attribute.FileTime.fromMillis(kept - 60_000));
        assertTrue(t.ensure(cut, 2));
        assertEquals(kept - 60_000, Files.getLastModifiedTime(BenchTables.file(cut, 0, 0)).toMillis(), "kept, not written again");
        assertFalse(Files.exists(cut.resolve(BenchTables.UNDERWAY)));
        assertEquals(Files.readString(whole.resolve(BenchTables.MANIFEST)), Files.readString(cut.resolve(BenchTables.MANIFEST)));
        for (int s = 0; s < 2; s++) {
            for (int f = 0; f < 3; f++) {
                assertArrayEquals(Files.readAllBytes(BenchTables.file(whole, s, f)), Files.readAllBytes(BenchTables.file(cut, s, f)));
            }
        }
        // a marker of other parameters keeps nothing
        BenchTables other = new BenchTables(600, 2, 1, 9, 100);
        Files.writeString(cut.resolve(BenchTables.UNDERWAY), t.header());
        Files.delete(cut.resolve(BenchTables.MANIFEST));
        assertTrue(other.ensure(cut, 2));
        assertTrue(other.present(cut));
        assertFalse(java.util.Arrays.equals(Files.readAllBytes(BenchTables.file(whole, 0, 0)),
                Files.readAllBytes(BenchTables.file(cut, 0, 0))));
    }

    /** Rows of a file as read by Parquet's example reader (n_ph as a double). */
    static List<double[]> read(Path file, int columns) throws IOException {
        List<double[]> rows = new ArrayList<>();
        try (ParquetReader<Group> r = ParquetReader.builder(new GroupReadSupport(),
                new org.apache.hadoop.fs.Path(file.toUri())).build()) {
            for (Group g = r.read(); g != null; g = r.read()) {
                double[] row = new double[columns];
                for (int c = 0; c < columns; c++) row[c] = c == 1 ? g.getInteger(c, 0) : g.getDouble(c, 0);
                rows.add(row);
            }
        }
        return rows;
    }
}
