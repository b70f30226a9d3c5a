package plumb.spark.build;

import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.catalyst.expressions.Abs;
import org.apache.spark.sql.catalyst.expressions.Add;
import org.apache.spark.sql.catalyst.expressions.Alias;
import org.apache.spark.sql.catalyst.expressions.And;
import org.apache.spark.sql.catalyst.expressions.AttributeReference;
import org.apache.spark.sql.catalyst.expressions.CaseWhen;
import org.apache.spark.sql.catalyst.expressions.Cast;
import org.apache.spark.sql.catalyst.expressions.Coalesce;
import org.apache.spark.sql.catalyst.expressions.Divide;
import org.apache.spark.sql.catalyst.expressions.EqualNullSafe;
import org.apache.spark.sql.catalyst.expressions.EqualTo;
import org.apache.spark.sql.catalyst.expressions.EulerNumber;
import org.apache.spark.sql.catalyst.expressions.Exp;
import org.apache.spark.sql.catalyst.expressions.Expression;
import org.apache.spark.sql.catalyst.expressions.GreaterThan;
import org.apache.spark.sql.catalyst.expressions.GreaterThanOrEqual;
import org.apache.spark.sql.catalyst.expressions.If;
import org.apache.spark.sql.catalyst.expressions.IsNotNull;
import org.apache.spark.sql.catalyst.expressions.IsNull;
import org.apache.spark.sql.catalyst.expressions.LessThan;
import org.apache.spark.sql.catalyst.expressions.LessThanOrEqual;
import org.apache.spark.sql.catalyst.expressions.Log;
import org.apache.spark.sql.catalyst.expressions.Logarithm;
import org.apache.spark.sql.catalyst.expressions.Multiply;
import org.apache.spark.sql.catalyst.expressions.NamedExpression;
import org.apache.spark.sql.catalyst.expressions.Not;
import org.apache.spark.sql.catalyst.expressions.Or;
import org.apache.spark.sql.catalyst.expressions.Pow;
import org.apache.spark.sql.catalyst.expressions.Sqrt;
import org.apache.spark.sql.catalyst.expressions.Subtract;
import org.apache.spark.sql.catalyst.expressions.UnaryMinus;
import org.apache.spark.sql.catalyst.expressions.UnaryPositive;
import org.apache.spark.sql.catalyst.plans.logical.LogicalPlan;
import org.apache.spark.sql.catalyst.plans.logical.Project;
import org.apache.spark.sql.types.BooleanType;
import org.apache.spark.sql.types.DataType;
import org.apache.spark.sql.types.DoubleType;
import org.apache.spark.sql.types.IntegerType;
import org.apache.spark.sql.types.LongType;
import plumb.spark.build.BatchExpr.Kind;
import scala.Tuple2;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;

/**
 * Turns an expression tree resolved by Spark's analysis into {@link BatchExpr} nodes, for the
 * subset whose semantics the nodes reproduce: columns and constants of type boolean, int, bigint
 * and double; + − × ÷; comparisons; AND, OR, NOT, IS [NOT] NULL; abs, sqrt, exp, ln/log, pow;
 * CASE WHEN, IF, COALESCE; casts between int, bigint and double. Any sub-tree without a column is
 * folded by Spark itself into a constant (so literals such as {@code 0.35}, a decimal, need no
 * decimal arithmetic here). Anything else throws {@link Unsupported}: the caller lets Spark
 * evaluate the whole table instead.
 */
final class BatchCompiler {

    /** The expression (or a part of it) is outside the subset. */
    static final class Unsupported extends Exception {
        private static final long serialVersionUID = 1L;

        Unsupported(String what) {
            super(what, null, false, false);
        }
    }

    /** The columns met so far by name: one node per column, shared by every expression of a pass. */
    private final Map<String, BatchExpr.Column> columns;

    BatchCompiler(Map<String, BatchExpr.Column> columns) {
        this.columns = columns;
    }

    /**
     * Spark's analysis of expressions over a table, in one go: the resolved trees (columns bound,
     * implicit casts inserted, functions looked up), in order.
     */
    static List<Expression> analysed(Dataset<Row> table, List<String> sql) {
        LogicalPlan plan = ((org.apache.spark.sql.classic.Dataset<Row>) table.selectExpr(sql.toArray(String[]::new)))
                .queryExecution().analyzed();
        if (!(plan instanceof Project p) || p.projectList().size() != sql.size()) {
            throw new IllegalStateException("Spark's analysis gave no projection of " + sql.size() + " columns");
        }
        List<Expression> out = new ArrayList<>();
        scala.collection.Iterator<NamedExpression> it = p.projectList().iterator();
        while (it.hasNext()) out.add((Expression) it.next());   // a NamedExpression is always an Expression
        return out;
    }

    /** The node kind and bits of a Spark type, or Unsupported. */
    static BatchExpr.Kind kind(DataType t) throws Unsupported {
        if (t instanceof BooleanType) return Kind.BOOL;
        if (t instanceof IntegerType || t instanceof LongType) return Kind.LONG;
        if (t instanceof DoubleType) return Kind.DOUBLE;
        throw new Unsupported("type " + t.simpleString());
    }

    static int bits(DataType t) {
        return t instanceof BooleanType ? 0 : t instanceof IntegerType ? 32 : 64;
    }

    /**
     * The node of each sub-expression compiled so far: an expression met again (a step several
     * regions share, {@code 2 * w} in twenty weights) is the same node, computed once per batch.
     * Keys are Spark's trees, equal when they are the same operation on the same columns.
     */
    private final Map<Expression, BatchExpr> made = new java.util.HashMap<>();

    BatchExpr compile(Expression e) throws Unsupported {
        if (e instanceof Alias a) return compile(a.child());
        BatchExpr known = made.get(e);
        if (known != null) return known;
        BatchExpr x = make(e);
        made.put(e, x);
        return x;
    }

    private BatchExpr make(Expression e) throws Unsupported {
        DataType type = e.dataType();
        Kind kind = kind(type);
        int bits = bits(type);
        if (e instanceof AttributeReference r) {
            BatchExpr.Column c = columns.computeIfAbsent(r.name(), n -> new BatchExpr.Column(n, kind, bits));
            if (c.kind != kind || c.bits != bits) throw new Unsupported("column " + r.name() + " read with two types");
            return c;
        }
        if (e.foldable()) {
            Object value;
            try {
                value = e.eval(null);
            } catch (RuntimeException x) {   // e.g. 1/0 in ANSI mode: Spark's own path reports it
                throw new Unsupported("constant that fails: " + x.getMessage());
            }
            return new BatchExpr.Constant(kind, bits, value);
        }
        if (e instanceof Add x) return arithmetic(BatchExpr.Op.ADD, x.left(), x.right(), kind, bits, false);
        if (e instanceof Subtract x) return arithmetic(BatchExpr.Op.SUBTRACT, x.left(), x.right(), kind, bits, false);
        if (e instanceof Multiply x) return arithmetic(BatchExpr.Op.MULTIPLY, x.left(), x.right(), kind, bits, false);
        if (e instanceof Divide x) {
            if (kind != Kind.DOUBLE) throw new Unsupported("division of " + type.simpleString());
            return arithmetic(BatchExpr.Op.DIVIDE, x.left(), x.right(), kind, bits, x.failOnError());
        }
        if (e instanceof UnaryMinus x) return new BatchExpr.Sign(same(x.child(), kind, bits), false);
        if (e instanceof UnaryPositive x) return same(x.child(), kind, bits);
        if (e instanceof Abs x) return new BatchExpr.Sign(same(x.child(), kind, bits), true);
        if (e instanceof Sqrt x) return math(BatchExpr.Function.SQRT, x.child(), null);
        if (e instanceof Exp x) return math(BatchExpr.Function.EXP, x.child(), null);
        if (e instanceof Log x) return math(BatchExpr.Function.LOG, x.child(), null);
        if (e instanceof Pow x) return math(BatchExpr.Function.POW, x.left(), x.right());
        if (e instanceof Logarithm x) {
            // log(x) is log to the base e: Spark computes ln x alone then (its generated code does)
            if (x.left() instanceof EulerNumber) return math(BatchExpr.Function.LOG, x.right(), null);
            return math(BatchExpr.Function.LOG_BASE, x.left(), x.right());
        }
        if (e instanceof EqualTo x) return comparison(BatchExpr.Compare.EQ, x.left(), x.right());
        if (e instanceof EqualNullSafe x) return comparison(BatchExpr.Compare.EQ_NULL_SAFE, x.left(), x.right());
        if (e instanceof LessThan x) return comparison(BatchExpr.Compare.LT, x.left(), x.right());
        if (e instanceof LessThanOrEqual x) return comparison(BatchExpr.Compare.LE, x.left(), x.right());
        if (e instanceof GreaterThan x) return comparison(BatchExpr.Compare.GT, x.left(), x.right());
        if (e instanceof GreaterThanOrEqual x) return comparison(BatchExpr.Compare.GE, x.left(), x.right());
        if (e instanceof And x) return new BatchExpr.Logical(BatchExpr.Logic.AND, bool(x.left()), bool(x.right()));
        if (e instanceof Or x) return new BatchExpr.Logical(BatchExpr.Logic.OR, bool(x.left()), bool(x.right()));
        if (e instanceof Not x) return new BatchExpr.Logical(BatchExpr.Logic.NOT, bool(x.child()), null);
        if (e instanceof IsNull x) return new BatchExpr.Logical(BatchExpr.Logic.IS_NULL, compile(x.child()), null);
        if (e instanceof IsNotNull x) return new BatchExpr.Logical(BatchExpr.Logic.IS_NOT_NULL, compile(x.child()), null);
        if (e instanceof If x) {
            return new BatchExpr.Choice(new BatchExpr[] {bool(x.predicate())}, new BatchExpr[] {same(x.trueValue(), kind, bits)},
                    same(x.falseValue(), kind, bits), kind, bits);
        }
        if (e instanceof CaseWhen x) {
            List<BatchExpr> conditions = new ArrayList<>(), values = new ArrayList<>();
            scala.collection.Iterator<Tuple2<Expression, Expression>> it = x.branches().iterator();
            while (it.hasNext()) {
                Tuple2<Expression, Expression> branch = it.next();
                conditions.add(bool(branch._1()));
                values.add(same(branch._2(), kind, bits));
            }
            BatchExpr otherwise = x.elseValue().isDefined() ? same(x.elseValue().get(), kind, bits) : null;
            return new BatchExpr.Choice(conditions.toArray(BatchExpr[]::new), values.toArray(BatchExpr[]::new), otherwise,
                    kind, bits);
        }
        if (e instanceof Coalesce x) {
            List<BatchExpr> children = new ArrayList<>();
            scala.collection.Iterator<Expression> it = x.children().iterator();
            while (it.hasNext()) children.add(same(it.next(), kind, bits));
            int last = children.size() - 1;
            BatchExpr[] conditions = new BatchExpr[last];
            for (int k = 0; k < last; k++) conditions[k] = new BatchExpr.Logical(BatchExpr.Logic.IS_NOT_NULL, children.get(k), null);
            return new BatchExpr.Choice(conditions, children.subList(0, last).toArray(BatchExpr[]::new), children.get(last),
                    kind, bits);
        }
        if (e instanceof Cast x) {
            BatchExpr from = compile(x.child());
            if (from.kind == kind && from.bits == bits) return from;
            if (from.kind == Kind.BOOL || kind == Kind.BOOL) throw new Unsupported("cast between boolean and number");
            return new BatchExpr.Convert(from, kind, bits);
        }
        throw new Unsupported(e.prettyName());
    }

    private BatchExpr arithmetic(BatchExpr.Op op, Expression a, Expression b, Kind kind, int bits, boolean failOnZero)
            throws Unsupported {
        if (kind == Kind.BOOL) throw new Unsupported("arithmetic on booleans");
        return new BatchExpr.Arithmetic(op, same(a, kind, bits), same(b, kind, bits), kind, bits, failOnZero);
    }

    private BatchExpr math(BatchExpr.Function f, Expression a, Expression b) throws Unsupported {
        return new BatchExpr.Math1(f, same(a, Kind.DOUBLE, 64), b == null ? null : same(b, Kind.DOUBLE, 64));
    }

    private BatchExpr comparison(BatchExpr.Compare op, Expression a, Expression b) throws Unsupported {
        BatchExpr x = compile(a), y = compile(b);
        if (x.kind != y.kind || x.bits != y.bits) throw new Unsupported("comparison of two types");
        return new BatchExpr.Comparison(op, x, y);
    }

    private BatchExpr bool(Expression e) throws Unsupported {
        return same(e, Kind.BOOL, 0);   // booleans have no bits
    }

    /** A child that Spark's analysis gave the expected type (it inserts the casts); anything else is not ours. */
    private BatchExpr same(Expression e, Kind kind, int bits) throws Unsupported {
        BatchExpr x = compile(e);
        if (x.kind != kind || (kind == Kind.LONG && x.bits != bits)) throw new Unsupported("operand of another type");
        return x;
    }
}
