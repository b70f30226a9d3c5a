package plumb.spark.build;

import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.RowFactory;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.sql.catalyst.expressions.Expression;
import org.apache.spark.sql.types.DataTypes;
import org.apache.spark.sql.types.StructType;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import plumb.spark.campaign.SparkRunner;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

/**
 * The batch evaluator against Spark itself, the reference library: the same expressions over the
 * same random table (nulls, NaN, ±0, ±∞, integer edge values) evaluated by Spark's own projection
 * and by {@link BatchExpr} nodes compiled from Spark's analysed trees must give the same values
 * bit for bit, and where Spark raises an error the nodes must refuse rather than guess.
 */
class BatchExprTest {

    static SparkRunner runner;
    static SparkSession spark;

    static final StructType SCHEMA = new StructType()
            .add("a", DataTypes.DoubleType, true).add("b", DataTypes.DoubleType, true)
            .add("i", DataTypes.IntegerType, true).add("j", DataTypes.LongType, true)
            .add("f", DataTypes.BooleanType, true);

    @BeforeAll
    static void start() {
        runner = SparkRunner.open("local[2]", 600);   // generous: the machine running the tests may be busy
        spark = SparkSession.builder().getOrCreate();
    }

    @AfterAll
    static void stop() {
        runner.close();
    }

    /** Doubles with the special values mixed in, small whole numbers (no overflow), some nulls everywhere. */
    static List<Row> randomRows(long seed, int n, boolean zeroDivisors) {
        SplittableRandom rng = new SplittableRandom(seed);
        double[] special = {Double.NaN, 0.0, -0.0, Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY, 1.0, -1.0, 2.0,
                Double.MIN_VALUE, 1e300, -1e-300, 0.5, 4.0};
        List<Row> rows = new ArrayList<>();
        for (int r = 0; r < n; r++) {
            Object a = rng.nextInt(10) == 0 ? null : rng.nextInt(4) == 0 ? special[rng.nextInt(special.length)]
                    : (rng.nextDouble() - 0.3) * Math.pow(10, rng.nextInt(7) - 3);
            Object b = rng.nextInt(10) == 0 ? null : rng.nextInt(4) == 0 ? special[rng.nextInt(special.length)]
                    : (rng.nextDouble() - 0.5) * 8;
            if (!zeroDivisors && b != null && (Double) b == 0) b = 3.0;
            Object i = rng.nextInt(8) == 0 ? null : rng.nextInt(2001) - 1000;
            Object j = rng.nextInt(8) == 0 ? null : rng.nextLong(-100_000, 100_000);
            Object f = rng.nextInt(6) == 0 ? null : rng.nextBoolean();
            rows.add(RowFactory.create(a, b, i, j, f));
        }
        return rows;
    }

    /** The columns of the rows as the reader fills them (zero where null). */
    static void fill(Map<String, BatchExpr.Column> columns, List<Row> rows, int from, int n) {
        for (BatchExpr.Column c : columns.values()) {
            int k = SCHEMA.fieldIndex(c.name);
            c.anyNull = false;
            for (int r = 0; r < n; r++) {
                Row row = rows.get(from + r);
                boolean isNull = row.isNullAt(k);
                c.nul[r] = isNull;
                c.anyNull |= isNull;
                switch (c.kind) {
                    case DOUBLE -> c.d[r] = isNull ? 0 : row.getDouble(k);
                    case LONG -> c.l[r] = isNull ? 0 : k == 2 ? row.getInt(k) : row.getLong(k);
                    case BOOL -> c.b[r] = !isNull && row.getBoolean(k);
                }
            }
        }
    }

    /** The analysed trees of the expressions over the table, in order. */
    static List<Expression> analysed(Dataset<Row> table, List<String> sql) {
        return BatchCompiler.analysed(table, sql);
    }

    /**
     * Evaluates the expressions over the rows in batches of {@code batchSize}; per expression the
     * values (Double, Long or Boolean, null for SQL null), or null for the expression when the
     * nodes refused some batch.
     */
    static List<List<Object>> evaluate(Dataset<Row> table, List<String> sql, List<Row> rows, int batchSize) throws Exception {
        Map<String, BatchExpr.Column> columns = new LinkedHashMap<>();
        BatchCompiler compiler = new BatchCompiler(columns);
        List<BatchExpr> roots = new ArrayList<>();
        for (Expression e : analysed(table, sql)) roots.add(compiler.compile(e));
        for (BatchExpr r : roots) r.allocate(batchSize);
        for (BatchExpr c : columns.values()) c.allocate(batchSize);
        List<List<Object>> out = new ArrayList<>();
        boolean[] refused = new boolean[roots.size()];
        for (int k = 0; k < roots.size(); k++) out.add(new ArrayList<>());
        for (int from = 0; from < rows.size(); from += batchSize) {
            int n = Math.min(batchSize, rows.size() - from);
            fill(columns, rows, from, n);
            for (int k = 0; k < roots.size(); k++) {
                BatchExpr.Batch batch = new BatchExpr.Batch();
                batch.n = n;
                BatchExpr r = roots.get(k);
                r.eval(batch);
                if (batch.refused != null) refused[k] = true;
                for (int i = 0; i < n; i++) {
                    out.get(k).add(r.isNull(i) ? null : switch (r.kind) {
                        case DOUBLE -> r.d[i];
                        case LONG -> r.l[i];
                        case BOOL -> r.b[i];
                    });
                }
            }
        }
        for (int k = 0; k < roots.size(); k++) if (refused[k]) out.set(k, null);
        return out;
    }

    static final List<String> EXPRESSIONS = List.of(
            "a + b", "a - b", "a * b", "a / b", "-a", "+a", "abs(a)", "abs(i)", "-j",
            "sqrt(a)", "exp(a)", "ln(a)", "log(a)", "log(2, a)", "log(b, a)", "pow(a, b)", "power(a, 2)",
            "a < b", "a <= b", "a = b", "a > 0.5", "a >= b", "a <=> b", "a != b", "NOT (a < b)",
            "a < b AND i > 3", "a < b OR f", "f AND i < 2", "NOT f", "f = (a > 0)",
            "a IS NULL", "i IS NOT NULL", "(a > 0) IS NULL",
            "CASE WHEN a > 0 THEN a WHEN b > 0 THEN b END", "CASE WHEN i > 2 THEN i * 2 ELSE j END",
            "CASE WHEN f THEN 1 WHEN a < 0 THEN 2 ELSE 3 END", "IF(f, a, b)", "IF(a > b, i, 0)",
            "coalesce(a, b, 0)", "coalesce(i, j)", "coalesce(a, i)",
            "CAST(i AS DOUBLE) * a", "i + 1", "i * j", "i / 3", "j - i", "i - 7 * i", "j + 2147483000",
            "0.35 * a", "2 * a - b", "i >= 2", "a = i", "a > j", "1 + 2", "a + NULL", "i / 0.5D",
            "a * 1e308 * 10", "abs(a) < 4 AND (a * a + b * b) / 2 > 1.5 OR i <=> NULL",
            "CAST(i * 1.5D AS INT)", "CAST(j AS INT) + i", "CAST(i / 7 AS BIGINT)");

    @Test
    void batchValuesEqualSparksOwnOnARandomTable() throws Exception {
        List<Row> rows = randomRows(11, 3000, false);
        Dataset<Row> table = spark.createDataFrame(rows, SCHEMA);
        List<Row> spark = table.selectExpr(EXPRESSIONS.toArray(String[]::new)).collectAsList();
        List<String> wrong = new ArrayList<>();
        for (int k = 0; k < EXPRESSIONS.size(); k++) {
            String e = EXPRESSIONS.get(k);
            List<Object> mine;
            try {
                mine = evaluate(table, List.of(e), rows, 700).get(0);   // several batches, the last one short
            } catch (BatchCompiler.Unsupported x) {
                wrong.add(e + ": not compiled: " + x.getMessage());
                continue;
            }
            if (mine == null) {
                wrong.add(e + ": refused although Spark evaluated it");
                continue;
            }
            for (int r = 0; r < rows.size(); r++) {
                try {
                    assertSame(spark.get(r).get(k), mine.get(r), e + " in row " + r + " " + rows.get(r));
                } catch (AssertionError x) {
                    wrong.add(x.getMessage());
                    break;
                }
            }
        }
        assertEquals(List.of(), wrong, "expressions whose values differ from Spark's");
    }

    @Test
    void sharedSubExpressionsAreOneNodeComputedOncePerStageWithSparksValues() throws Exception {
        // expressions compiled together share the node of a repeated sub-expression (a step that
        // several regions share, 2 * w in many weights); evaluated in one stage per batch, the
        // values stay Spark's, batch after batch (a stale value from the batch before would show)
        List<Row> rows = randomRows(14, 2_000, false);
        Dataset<Row> table = spark.createDataFrame(rows, SCHEMA);
        List<String> sql = List.of("2 * a - b", "2 * a + b", "a < b", "a < b AND i > 3", "CASE WHEN a < b THEN 2 * a END",
                "i > 3", "a > 0.5", "abs(a) < 4 AND a < b", "2 * a");
        List<Row> expected = table.selectExpr(sql.toArray(String[]::new)).collectAsList();
        Map<String, BatchExpr.Column> columns = new LinkedHashMap<>();
        BatchCompiler compiler = new BatchCompiler(columns);
        List<BatchExpr> roots = new ArrayList<>();
        for (Expression e : analysed(table, sql)) roots.add(compiler.compile(e));
        BatchExpr twiceA = roots.get(8);
        assertTrue(((BatchExpr.Arithmetic) roots.get(0)).a == twiceA && ((BatchExpr.Arithmetic) roots.get(1)).a == twiceA,
                "2 * a is one node");
        assertTrue(((BatchExpr.Logical) roots.get(3)).a == roots.get(2), "a < b is one node");
        assertTrue(((BatchExpr.Logical) roots.get(3)).c == roots.get(5), "i > 3 is one node");
        int batchSize = 300;
        for (BatchExpr r : roots) r.allocate(batchSize);
        BatchExpr.Batch batch = new BatchExpr.Batch();
        for (int from = 0; from < rows.size(); from += batchSize) {
            int n = Math.min(batchSize, rows.size() - from);
            fill(columns, rows, from, n);
            batch.next(n);
            for (BatchExpr r : roots) r.eval(batch);
            assertNull(batch.refused);
            for (int k = 0; k < roots.size(); k++) {
                BatchExpr r = roots.get(k);
                for (int i = 0; i < n; i++) {
                    Object mine = r.isNull(i) ? null : switch (r.kind) {
                        case DOUBLE -> r.d[i];
                        case LONG -> r.l[i];
                        case BOOL -> r.b[i];
                    };
                    assertSame(expected.get(from + i).get(k), mine, sql.get(k) + " in row " + (from + i));
                }
            }
        }
    }

    /** Spark's value and ours: both null, or the same number (same bits for doubles: NaN, −0.0) or boolean. */
    static void assertSame(Object expected, Object actual, String what) {
        if (expected == null || actual == null) {
            assertEquals(expected, actual, what);
        } else if (expected instanceof Double x) {
            assertEquals(Double.doubleToLongBits(x), Double.doubleToLongBits((Double) actual), what + ": " + x + " vs " + actual);
        } else if (expected instanceof Number x) {
            assertEquals(x.longValue(), (long) (Long) actual, what);
        } else {
            assertEquals(expected, actual, what);
        }
    }

    @Test
    void whereSparkFailsTheNodesRefuseAndWhereItGivesNullTheyDoToo() throws Exception {
        List<Row> rows = randomRows(12, 500, true);
        Dataset<Row> table = spark.createDataFrame(rows, SCHEMA);
        boolean ansi = Boolean.parseBoolean(spark.conf().get("spark.sql.ansi.enabled"));
        List<String> failing = new ArrayList<>(List.of("i * 2147483647", "j * 922337203685477", "CAST(a * 1e10 AS INT)"));
        if (ansi) failing.add("a / b");
        for (String e : ansi ? failing : List.<String>of()) {
            assertThrows(Exception.class, () -> table.selectExpr(e).collectAsList(), e + " should fail in Spark");
            assertNull(evaluate(table, List.of(e), rows, 256).get(0), e + " should be refused");
        }
        String old = spark.conf().get("spark.sql.ansi.enabled");
        try {
            spark.conf().set("spark.sql.ansi.enabled", "false");
            Dataset<Row> legacy = spark.createDataFrame(rows, SCHEMA);
            List<Row> expected = legacy.selectExpr("a / b").collectAsList();
            List<Object> mine = evaluate(legacy, List.of("a / b"), rows, 256).get(0);
            assertNotNull(mine, "a / b with legacy semantics: null for a zero divisor, not refused");
            int nulls = 0;
            for (int r = 0; r < rows.size(); r++) {
                assertSame(expected.get(r).get(0), mine.get(r), "a / b, row " + r);
                if (mine.get(r) == null) nulls++;
            }
            assertTrue(nulls > 0, "the table has zero divisors");
        } finally {
            spark.conf().set("spark.sql.ansi.enabled", old);
        }
    }

    @Test
    void expressionsOutsideTheSubsetAreNotCompiled() {
        Dataset<Row> table = spark.createDataFrame(randomRows(13, 10, false), SCHEMA);
        for (String e : List.of("sin(a)", "a % b", "i div 2", "CAST(a AS STRING)", "greatest(a, b)", "CAST(a AS FLOAT) + 1",
                "i / 0.5" /* decimal arithmetic */)) {
            Expression tree = analysed(table, List.of(e)).get(0);
            try {
                new BatchCompiler(new LinkedHashMap<>()).compile(tree);
                fail(e + " compiled, but is outside the subset");
            } catch (BatchCompiler.Unsupported expected) {
                // the table goes to Spark's own evaluation
            }
        }
    }
}
