package plumb.spark.build;

import org.junit.jupiter.api.Test;
import plumb.spark.build.TaskPlan.Group;
import plumb.spark.build.TaskPlan.Range;
import plumb.spark.build.TaskPlan.Task;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;

/** How a pass's files are cut into tasks: whole row groups, in order, up to a number of bytes read. */
class TaskPlanTest {

    static String show(List<Task> tasks) {
        StringBuilder s = new StringBuilder();
        for (Task t : tasks) {
            s.append(t.pass()).append(":");
            for (Range r : t.ranges()) s.append(' ').append(r.file()).append('[').append(r.start()).append(',').append(r.end()).append(')');
            s.append("; ");
        }
        return s.toString();
    }

    @Test
    void aBigFileIsSharedBySeveralTasksAndSmallFilesShareOne() {
        // file a: three row groups of 60 bytes read each (their ranges touch); b and c: one small group each
        List<List<Group>> groups = List.of(
                List.of(new Group(4, 104, 60), new Group(104, 204, 60), new Group(204, 304, 60)),
                List.of(new Group(4, 54, 30)),
                List.of(new Group(4, 44, 20)));
        List<Task> tasks = TaskPlan.cut(7, List.of("a", "b", "c"), groups, 130);
        // 60 + 60 fit in 130, a third 60 does not; then 60 + 30 + 20 = 110 fit
        assertEquals("7: a[4,204); 7: a[204,304) b[4,54) c[4,44); ", show(tasks));
    }

    @Test
    void aGroupLargerThanTheLimitIsATaskOfItsOwnAndEmptyFilesGiveNoTask() {
        List<List<Group>> groups = List.of(List.of(), List.of(new Group(4, 504, 500), new Group(504, 604, 10)),
                List.of(new Group(4, 14, 5)));
        assertEquals("0: b[4,504); 0: b[504,604) c[4,14); ", show(TaskPlan.cut(0, List.of("a", "b", "c"), groups, 100)));
        assertEquals("0: b[4,504); 0: b[504,604); 0: c[4,14); ", show(TaskPlan.cut(0, List.of("a", "b", "c"), groups, 1)));
        assertEquals("", show(TaskPlan.cut(0, List.of("a"), List.of(List.of()), 100)));
    }

    @Test
    void groupsThatDoNotTouchMakeRangesOfTheirOwn() {
        List<List<Group>> groups = List.of(List.of(new Group(4, 100, 10), new Group(120, 200, 10)));
        assertEquals("1: a[4,100) a[120,200); ", show(TaskPlan.cut(1, List.of("a"), groups, 1000)));
    }

    @Test
    void blocksOfMergedTasksNeverMixPasses() {
        List<Task> tasks = new java.util.ArrayList<>();
        for (int pass : new int[] {0, 0, 0, 0, 0, 1, 1, 2}) tasks.add(new Task(pass, new Range[0]));
        assertEquals("[0, 0, 1, 1, 2, 3, 3, 4]", java.util.Arrays.toString(ParquetPass.blocks(tasks, 2)));
        assertEquals("[0, 0, 0, 0, 0, 1, 1, 2]", java.util.Arrays.toString(ParquetPass.blocks(tasks, 32)));
    }
}
