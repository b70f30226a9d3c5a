package plumb.spark.build;

import java.io.Serializable;

/**
 * One node of an expression evaluated over a batch of events at once: a column, a constant or an
 * operation on other nodes, with Spark SQL's semantics (made by {@link BatchCompiler} from the
 * expression tree Spark's analysis resolved). Each node owns a value array and a null array for
 * one batch; evaluating a node evaluates its children first, then runs one loop over the batch.
 *
 * <p>Where Spark would raise an error or where the result is not reproduced bit for bit (integer
 * overflow, a float outside an integer's range, a division by zero in ANSI mode) a node does not
 * guess: it sets {@link Batch#refused} and the caller goes back to Spark's own evaluation. Nodes
 * evaluate every event they are given (only the events that need a weight, see
 * {@link BatchTally}, but both branches of a CASE, where Spark evaluates the one taken), so such a
 * refusal may come from an event Spark would not have evaluated; it only costs the time of the
 * other path.
 */
abstract class BatchExpr implements Serializable {

    private static final long serialVersionUID = 1L;

    /** How a node holds its values: booleans, whole numbers (int and bigint) or doubles. */
    enum Kind { BOOL, LONG, DOUBLE }

    /**
     * What all nodes of one evaluation share: the batch's size, its stage and why it was refused,
     * if it was. A stage is one evaluation over the same n events; every stage of every batch
     * in this process has a number of its own, so a node knows whether it has been computed for it.
     */
    static final class Batch {
        private static final java.util.concurrent.atomic.AtomicLong STAGES = new java.util.concurrent.atomic.AtomicLong();
        int n;
        long stage = STAGES.incrementAndGet();
        String refused;

        /** A new stage over n events (the nodes' values from earlier stages are stale). */
        void next(int n) {
            this.n = n;
            stage = STAGES.incrementAndGet();
        }

        void refuse(String why) {
            if (refused == null) refused = why;
        }
    }

    final Kind kind;
    /** For LONG: the bits of Spark's type (32 for int, 64 for bigint), for the overflow checks. */
    final int bits;
    transient double[] d;
    transient long[] l;
    transient boolean[] b;
    /** null[i]: the value of event i is SQL null (its entry in the value array is 0 / false). */
    transient boolean[] nul;
    /** Whether any event of the batch is null (nul may then be skipped). */
    transient boolean anyNull;
    /** The stage the arrays hold (0: none). */
    private transient long evaluated;

    BatchExpr(Kind kind, int bits) {
        this.kind = kind;
        this.bits = bits;
    }

    /** Value and null arrays for batches of up to {@code capacity} events; children first. */
    void allocate(int capacity) {
        if (nul != null && nul.length >= capacity) return;
        for (BatchExpr c : children()) c.allocate(capacity);
        nul = new boolean[capacity];
        switch (kind) {
            case BOOL -> b = new boolean[capacity];
            case LONG -> l = new long[capacity];
            case DOUBLE -> d = new double[capacity];
        }
    }

    abstract BatchExpr[] children();

    /**
     * Fills the value and null arrays for the batch's n events, once per {@link Batch#next
     * stage}: a node shared by several expressions (the compiler makes one node per distinct
     * sub-expression) is computed once.
     */
    final void eval(Batch batch) {
        if (evaluated == batch.stage) return;
        compute(batch);
        evaluated = batch.stage;
    }

    /** The node's own loop over the batch, its children first. */
    abstract void compute(Batch batch);

    /** The value of event i as a double (NaN where null): what the histogram loop reads. */
    final double asDouble(int i) {
        if (anyNull && nul[i]) return Double.NaN;
        return kind == Kind.DOUBLE ? d[i] : (double) l[i];
    }

    /** Whether event i's value is true (null and false are not). */
    final boolean isTrue(int i) {
        return b[i] && !(anyNull && nul[i]);
    }

    /** nul = a.nul OR c.nul over n events; values of null events are zeroed by the caller where it matters. */
    final void nullsOf(int n, BatchExpr a, BatchExpr c) {
        anyNull = a.anyNull || c.anyNull;
        if (!anyNull) return;
        for (int i = 0; i < n; i++) nul[i] = (a.anyNull && a.nul[i]) || (c.anyNull && c.nul[i]);
    }

    final void nullsOf(int n, BatchExpr a) {
        anyNull = a.anyNull;
        if (anyNull) System.arraycopy(a.nul, 0, nul, 0, n);
    }

    final boolean isNull(int i) {
        return anyNull && nul[i];
    }

    // ---- leaves

    /** A column of the table; its arrays are filled by the reader of the batch. */
    static final class Column extends BatchExpr {
        private static final long serialVersionUID = 1L;
        final String name;

        Column(String name, Kind kind, int bits) {
            super(kind, bits);
            this.name = name;
        }

        @Override
        BatchExpr[] children() {
            return new BatchExpr[0];
        }

        @Override
        void compute(Batch batch) {
            // filled by the reader
        }
    }

    /** A constant (Spark folded it: literals, casts of literals, arithmetic on them), or null. */
    static final class Constant extends BatchExpr {
        private static final long serialVersionUID = 1L;
        final boolean isNullValue;
        final double dv;
        final long lv;
        final boolean bv;
        private transient int filled;

        Constant(Kind kind, int bits, Object value) {
            super(kind, bits);
            isNullValue = value == null;
            dv = value instanceof Number x && kind == Kind.DOUBLE ? x.doubleValue() : 0;
            lv = value instanceof Number x && kind == Kind.LONG ? x.longValue() : 0;
            bv = value instanceof Boolean x && x;
        }

        @Override
        BatchExpr[] children() {
            return new BatchExpr[0];
        }

        @Override
        void compute(Batch batch) {
            int n = batch.n;
            if (filled >= n) return;   // the arrays keep the constant from batch to batch
            for (int i = 0; i < n; i++) {
                nul[i] = isNullValue;
                switch (kind) {
                    case BOOL -> b[i] = bv;
                    case LONG -> l[i] = lv;
                    case DOUBLE -> d[i] = dv;
                }
            }
            anyNull = isNullValue;
            filled = n;
        }
    }

    // ---- arithmetic

    enum Op { ADD, SUBTRACT, MULTIPLY, DIVIDE }

    /** a op b; whole numbers exact (overflow refused), doubles as Java does, division by zero null or refused (ANSI). */
    static final class Arithmetic extends BatchExpr {
        private static final long serialVersionUID = 1L;
        final Op op;
        final BatchExpr a, c;
        final boolean failOnZero;

        Arithmetic(Op op, BatchExpr a, BatchExpr c, Kind kind, int bits, boolean failOnZero) {
            super(kind, bits);
            this.op = op;
            this.a = a;
            this.c = c;
            this.failOnZero = failOnZero;
        }

        @Override
        BatchExpr[] children() {
            return new BatchExpr[] {a, c};
        }

        @Override
        void compute(Batch batch) {
            a.eval(batch);
            c.eval(batch);
            int n = batch.n;
            nullsOf(n, a, c);
            if (kind == Kind.DOUBLE) {
                double[] x = a.d, y = c.d, out = d;
                switch (op) {
                    case ADD -> { for (int i = 0; i < n; i++) out[i] = x[i] + y[i]; }
                    case SUBTRACT -> { for (int i = 0; i < n; i++) out[i] = x[i] - y[i]; }
                    case MULTIPLY -> { for (int i = 0; i < n; i++) out[i] = x[i] * y[i]; }
                    case DIVIDE -> divide(batch, x, y, out, n);
                }
                return;
            }
            long[] x = a.l, y = c.l, out = l;
            long lo = bits == 32 ? Integer.MIN_VALUE : Long.MIN_VALUE, hi = bits == 32 ? Integer.MAX_VALUE : Long.MAX_VALUE;
            for (int i = 0; i < n; i++) {
                if (isNull(i)) {
                    out[i] = 0;
                    continue;
                }
                long v;
                try {
                    v = switch (op) {
                        case ADD -> Math.addExact(x[i], y[i]);
                        case SUBTRACT -> Math.subtractExact(x[i], y[i]);
                        case MULTIPLY -> Math.multiplyExact(x[i], y[i]);
                        case DIVIDE -> throw new IllegalStateException("whole-number division is not compiled");
                    };
                } catch (ArithmeticException e) {
                    v = lo;
                    batch.refuse("whole-number overflow");
                }
                if (v < lo || v > hi) batch.refuse("whole-number overflow");
                out[i] = v;
            }
        }

        /** Spark: a null or zero divisor gives null (or, in ANSI mode, a zero divisor an error). */
        private void divide(Batch batch, double[] x, double[] y, double[] out, int n) {
            boolean zero = false;
            for (int i = 0; i < n; i++) {
                double q = y[i];
                if (q == 0 && !isNull(i)) {
                    zero = true;
                    out[i] = 0;
                } else {
                    out[i] = x[i] / q;
                }
            }
            if (!zero) return;
            if (failOnZero) {
                batch.refuse("division by zero");
                return;
            }
            if (!anyNull) java.util.Arrays.fill(nul, 0, n, false);
            anyNull = true;
            for (int i = 0; i < n; i++) if (y[i] == 0) nul[i] = true;
        }
    }

    /** −a, or |a|: whole numbers refuse the one value without a negative. */
    static final class Sign extends BatchExpr {
        private static final long serialVersionUID = 1L;
        final BatchExpr a;
        final boolean abs;

        Sign(BatchExpr a, boolean abs) {
            super(a.kind, a.bits);
            this.a = a;
            this.abs = abs;
        }

        @Override
        BatchExpr[] children() {
            return new BatchExpr[] {a};
        }

        @Override
        void compute(Batch batch) {
            a.eval(batch);
            int n = batch.n;
            nullsOf(n, a);
            if (kind == Kind.DOUBLE) {
                for (int i = 0; i < n; i++) d[i] = abs ? Math.abs(a.d[i]) : -a.d[i];
                return;
            }
            long min = bits == 32 ? Integer.MIN_VALUE : Long.MIN_VALUE;
            for (int i = 0; i < n; i++) {
                long v = a.l[i];
                if (v == min) batch.refuse("whole-number overflow");
                l[i] = abs ? Math.abs(v) : -v;
            }
        }
    }

    enum Function { SQRT, EXP, LOG, POW, LOG_BASE }

    /**
     * sqrt, exp, ln (null for x ≤ 0), pow and log to a base (null when either is ≤ 0): the same
     * java.lang.StrictMath functions as Spark, so the same bits.
     */
    static final class Math1 extends BatchExpr {
        private static final long serialVersionUID = 1L;
        final Function f;
        final BatchExpr a, c;   // c: the exponent of POW, the argument of LOG_BASE (a is the base)

        Math1(Function f, BatchExpr a, BatchExpr c) {
            super(Kind.DOUBLE, 64);
            this.f = f;
            this.a = a;
            this.c = c;
        }

        @Override
        BatchExpr[] children() {
            return c == null ? new BatchExpr[] {a} : new BatchExpr[] {a, c};
        }

        @Override
        void compute(Batch batch) {
            a.eval(batch);
            if (c != null) c.eval(batch);
            int n = batch.n;
            if (c == null) nullsOf(n, a);
            else nullsOf(n, a, c);
            double[] x = a.d, out = d;
            switch (f) {
                case SQRT -> { for (int i = 0; i < n; i++) out[i] = StrictMath.sqrt(x[i]); }
                case EXP -> { for (int i = 0; i < n; i++) out[i] = StrictMath.exp(x[i]); }
                case POW -> { for (int i = 0; i < n; i++) out[i] = StrictMath.pow(x[i], c.d[i]); }
                case LOG -> {
                    for (int i = 0; i < n; i++) {
                        if (x[i] <= 0) nullAt(i, n);
                        else out[i] = StrictMath.log(x[i]);
                    }
                }
                case LOG_BASE -> {
                    double[] y = c.d;
                    for (int i = 0; i < n; i++) {
                        if (x[i] <= 0 || y[i] <= 0) nullAt(i, n);
                        else out[i] = StrictMath.log(y[i]) / StrictMath.log(x[i]);
                    }
                }
            }
        }

        private void nullAt(int i, int n) {
            if (!anyNull) {
                java.util.Arrays.fill(nul, 0, n, false);
                anyNull = true;
            }
            nul[i] = true;
            d[i] = 0;
        }
    }

    // ---- comparisons and logic

    enum Compare { EQ, LT, LE, GT, GE, EQ_NULL_SAFE }

    /**
     * a compared with b. Doubles in Spark SQL's order: NaN equals NaN and is above every other
     * number, −0.0 equals 0.0. {@code <=>} is never null: two nulls are equal.
     */
    static final class Comparison extends BatchExpr {
        private static final long serialVersionUID = 1L;
        final Compare op;
        final BatchExpr a, c;

        Comparison(Compare op, BatchExpr a, BatchExpr c) {
            super(Kind.BOOL, 0);
            this.op = op;
            this.a = a;
            this.c = c;
        }

        @Override
        BatchExpr[] children() {
            return new BatchExpr[] {a, c};
        }

        @Override
        void compute(Batch batch) {
            a.eval(batch);
            c.eval(batch);
            int n = batch.n;
            boolean constant = c instanceof Constant k && !k.isNullValue;
            switch (a.kind) {
                case DOUBLE -> {
                    if (constant && !Double.isNaN(((Constant) c).dv)) doubles(a.d, ((Constant) c).dv, n);
                    else doubles(a.d, c.d, n);
                }
                case LONG -> {
                    if (constant) longs(a.l, ((Constant) c).lv, n);
                    else longs(a.l, c.l, n);
                }
                case BOOL -> {
                    for (int i = 0; i < n; i++) b[i] = test(Boolean.compare(a.b[i], c.b[i]));
                }
            }
            if (op != Compare.EQ_NULL_SAFE) {
                nullsOf(n, a, c);
                return;
            }
            anyNull = false;
            if (!a.anyNull && !c.anyNull) return;
            for (int i = 0; i < n; i++) {
                boolean x = a.isNull(i), y = c.isNull(i);
                if (x || y) b[i] = x && y;
            }
        }

        private boolean test(int cmp) {
            return switch (op) {
                case EQ, EQ_NULL_SAFE -> cmp == 0;
                case LT -> cmp < 0;
                case LE -> cmp <= 0;
                case GT -> cmp > 0;
                case GE -> cmp >= 0;
            };
        }

        /**
         * Doubles in Spark's order, one loop per operator without branches on the values: x < y
         * holds when it holds in Java or when y alone is NaN; x ≤ y when it holds in Java or when
         * y is NaN; x = y when it holds in Java or when both are NaN (Java's comparisons already
         * take −0.0 as 0.0).
         */
        private void doubles(double[] x, double[] y, int n) {
            boolean[] out = b;
            switch (op) {
                case LT -> { for (int i = 0; i < n; i++) out[i] = x[i] < y[i] | (y[i] != y[i] & x[i] == x[i]); }
                case LE -> { for (int i = 0; i < n; i++) out[i] = x[i] <= y[i] | y[i] != y[i]; }
                case GT -> { for (int i = 0; i < n; i++) out[i] = y[i] < x[i] | (x[i] != x[i] & y[i] == y[i]); }
                case GE -> { for (int i = 0; i < n; i++) out[i] = y[i] <= x[i] | x[i] != x[i]; }
                case EQ, EQ_NULL_SAFE -> { for (int i = 0; i < n; i++) out[i] = x[i] == y[i] | (x[i] != x[i] & y[i] != y[i]); }
            }
        }

        /** As {@link #doubles(double[], double[], int)} with y a number (not NaN) for every event. */
        private void doubles(double[] x, double y, int n) {
            boolean[] out = b;
            switch (op) {
                case LT -> { for (int i = 0; i < n; i++) out[i] = x[i] < y; }
                case LE -> { for (int i = 0; i < n; i++) out[i] = x[i] <= y; }
                case GT -> { for (int i = 0; i < n; i++) out[i] = y < x[i] | x[i] != x[i]; }
                case GE -> { for (int i = 0; i < n; i++) out[i] = y <= x[i] | x[i] != x[i]; }
                case EQ, EQ_NULL_SAFE -> { for (int i = 0; i < n; i++) out[i] = x[i] == y; }
            }
        }

        private void longs(long[] x, long y, int n) {
            boolean[] out = b;
            switch (op) {
                case LT -> { for (int i = 0; i < n; i++) out[i] = x[i] < y; }
                case LE -> { for (int i = 0; i < n; i++) out[i] = x[i] <= y; }
                case GT -> { for (int i = 0; i < n; i++) out[i] = x[i] > y; }
                case GE -> { for (int i = 0; i < n; i++) out[i] = x[i] >= y; }
                case EQ, EQ_NULL_SAFE -> { for (int i = 0; i < n; i++) out[i] = x[i] == y; }
            }
        }

        private void longs(long[] x, long[] y, int n) {
            boolean[] out = b;
            switch (op) {
                case LT -> { for (int i = 0; i < n; i++) out[i] = x[i] < y[i]; }
                case LE -> { for (int i = 0; i < n; i++) out[i] = x[i] <= y[i]; }
                case GT -> { for (int i = 0; i < n; i++) out[i] = x[i] > y[i]; }
                case GE -> { for (int i = 0; i < n; i++) out[i] = x[i] >= y[i]; }
                case EQ, EQ_NULL_SAFE -> { for (int i = 0; i < n; i++) out[i] = x[i] == y[i]; }
            }
        }
    }

    enum Logic { AND, OR, NOT, IS_NULL, IS_NOT_NULL }

    /** AND, OR and NOT in three-valued logic (false AND null is false, true OR null is true), IS [NOT] NULL. */
    static final class Logical extends BatchExpr {
        private static final long serialVersionUID = 1L;
        final Logic op;
        final BatchExpr a, c;

        Logical(Logic op, BatchExpr a, BatchExpr c) {
            super(Kind.BOOL, 0);
            this.op = op;
            this.a = a;
            this.c = c;
        }

        @Override
        BatchExpr[] children() {
            return c == null ? new BatchExpr[] {a} : new BatchExpr[] {a, c};
        }

        @Override
        void compute(Batch batch) {
            a.eval(batch);
            if (c != null) c.eval(batch);
            int n = batch.n;
            switch (op) {
                case IS_NULL, IS_NOT_NULL -> {
                    boolean want = op == Logic.IS_NULL;
                    for (int i = 0; i < n; i++) b[i] = a.isNull(i) == want;
                    anyNull = false;
                }
                case NOT -> {
                    nullsOf(n, a);
                    for (int i = 0; i < n; i++) b[i] = !a.b[i] && !isNull(i);
                }
                case AND, OR -> {
                    boolean and = op == Logic.AND;
                    anyNull = false;
                    if (!a.anyNull && !c.anyNull) {
                        boolean[] x = a.b, y = c.b, out = b;
                        if (and) for (int i = 0; i < n; i++) out[i] = x[i] & y[i];
                        else for (int i = 0; i < n; i++) out[i] = x[i] | y[i];
                        return;
                    }
                    for (int i = 0; i < n; i++) {
                        boolean xn = a.isNull(i), yn = c.isNull(i);
                        // the deciding value: false for AND, true for OR, on a side that is not null
                        boolean decided = (!xn && a.b[i] != and) || (!yn && c.b[i] != and);
                        if (decided) {
                            b[i] = !and;
                            nul[i] = false;
                        } else if (xn || yn) {
                            b[i] = false;
                            nul[i] = true;
                            anyNull = true;
                        } else {
                            b[i] = and;
                            nul[i] = false;
                        }
                    }
                }
            }
        }
    }

    // ---- conditionals and casts

    /**
     * CASE WHEN c1 THEN v1 … ELSE e END (IF is one branch, COALESCE the branches "v IS NOT NULL"):
     * the first condition that is true (null counts as false) picks; no else gives null.
     */
    static final class Choice extends BatchExpr {
        private static final long serialVersionUID = 1L;
        final BatchExpr[] conditions, values;
        final BatchExpr otherwise;   // may be null

        Choice(BatchExpr[] conditions, BatchExpr[] values, BatchExpr otherwise, Kind kind, int bits) {
            super(kind, bits);
            this.conditions = conditions;
            this.values = values;
            this.otherwise = otherwise;
        }

        @Override
        BatchExpr[] children() {
            BatchExpr[] all = new BatchExpr[conditions.length + values.length + (otherwise == null ? 0 : 1)];
            System.arraycopy(conditions, 0, all, 0, conditions.length);
            System.arraycopy(values, 0, all, conditions.length, values.length);
            if (otherwise != null) all[all.length - 1] = otherwise;
            return all;
        }

        @Override
        void compute(Batch batch) {
            for (BatchExpr e : conditions) e.eval(batch);
            for (BatchExpr e : values) e.eval(batch);
            if (otherwise != null) otherwise.eval(batch);
            int n = batch.n;
            anyNull = false;
            for (int i = 0; i < n; i++) {
                BatchExpr v = otherwise;
                for (int k = 0; k < conditions.length; k++) {
                    if (conditions[k].isTrue(i)) {
                        v = values[k];
                        break;
                    }
                }
                boolean isNullHere = v == null || v.isNull(i);
                nul[i] = isNullHere;
                anyNull |= isNullHere;
                if (isNullHere) v = null;
                switch (kind) {
                    case BOOL -> b[i] = v != null && v.b[i];
                    case LONG -> l[i] = v == null ? 0 : v.l[i];
                    case DOUBLE -> d[i] = v == null ? 0 : v.d[i];
                }
            }
        }
    }

    /**
     * A cast between int, bigint and double: widening is exact (bigint to double rounds as Java
     * does); a double to a whole number truncates toward zero, and values Spark would refuse or
     * saturate (NaN, infinite, out of range) are refused here.
     */
    static final class Convert extends BatchExpr {
        private static final long serialVersionUID = 1L;
        final BatchExpr a;

        Convert(BatchExpr a, Kind kind, int bits) {
            super(kind, bits);
            this.a = a;
        }

        @Override
        BatchExpr[] children() {
            return new BatchExpr[] {a};
        }

        @Override
        void compute(Batch batch) {
            a.eval(batch);
            int n = batch.n;
            nullsOf(n, a);
            if (kind == Kind.DOUBLE) {
                if (a.kind == Kind.DOUBLE) System.arraycopy(a.d, 0, d, 0, n);
                else for (int i = 0; i < n; i++) d[i] = (double) a.l[i];
                return;
            }
            // int: lo < v < hi (truncation then fits); bigint: lo <= v < hi (−2⁶³ itself is a double)
            double lo = bits == 32 ? -2147483649.0 : -9223372036854775808.0;
            double hi = bits == 32 ? 2147483648.0 : 9223372036854775808.0;
            for (int i = 0; i < n; i++) {
                if (isNull(i)) {
                    l[i] = 0;
                    continue;
                }
                if (a.kind == Kind.LONG) {
                    long v = a.l[i];
                    if (bits == 32 && (v < Integer.MIN_VALUE || v > Integer.MAX_VALUE)) batch.refuse("whole-number overflow");
                    l[i] = v;
                    continue;
                }
                double v = a.d[i];
                boolean inside = bits == 32 ? v > lo && v < hi : v >= lo && v < hi;   // NaN is outside
                if (!inside) {
                    batch.refuse("a double outside the whole-number range");
                    l[i] = 0;
                } else {
                    l[i] = (long) v;
                }
            }
        }
    }
}
