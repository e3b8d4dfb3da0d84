using System.Runtime.CompilerServices;

namespace FitSpec.Expressions;

/// <summary>
/// One column-wise evaluation. Each node becomes either a scalar (constant subtrees fold for free) or an array;
/// arrays this evaluator allocated are overwritten in place by the parent or recycled once dead, so a whole tree
/// needs about as many arrays as its evaluation has live at once. Caller columns are never written.
/// Loops are generic over struct operations so each one compiles to a tight, call-free loop.
/// </summary>
internal sealed class ColumnEvaluator
{
    private readonly Func<string, double[]> _column;
    private readonly int _rows;
    private readonly Dictionary<string, double[]> _columns = new(StringComparer.Ordinal);
    private readonly Stack<double[]> _free = new();

    internal ColumnEvaluator(Func<string, double[]> column, int rows)
    {
        _column = column;
        _rows = rows;
    }

    internal Vec Evaluate(Expr node)
    {
        RuntimeHelpers.EnsureSufficientExecutionStack();
        switch (node)
        {
            case NumberExpr number:
                return Vec.Of(number.Value);
            case ColumnExpr column:
                return Vec.Borrowed(Column(column.Name));
            case UnaryExpr unary:
                var operand = Evaluate(unary.Operand);
                return unary.Operator == UnaryOperator.Negate ? Unary<NegateOp>(operand) : operand;
            case BinaryExpr { Operator: BinaryOperator.Power } power:
                return Power(Evaluate(power.Left), Evaluate(power.Right));
            case BinaryExpr binary:
                var left = Evaluate(binary.Left);
                var right = Evaluate(binary.Right);
                return binary.Operator switch
                {
                    BinaryOperator.Add => Binary<AddOp>(left, right),
                    BinaryOperator.Subtract => Binary<SubtractOp>(left, right),
                    BinaryOperator.Multiply => Binary<MultiplyOp>(left, right),
                    _ => Binary<DivideOp>(left, right),
                };
            case ComparisonExpr comparison:
                var a = Evaluate(comparison.Left);
                var b = Evaluate(comparison.Right);
                return comparison.Operator switch
                {
                    ComparisonOperator.Less => Binary<LessOp>(a, b),
                    ComparisonOperator.LessOrEqual => Binary<LessOrEqualOp>(a, b),
                    ComparisonOperator.Greater => Binary<GreaterOp>(a, b),
                    ComparisonOperator.GreaterOrEqual => Binary<GreaterOrEqualOp>(a, b),
                    ComparisonOperator.Equal => Binary<EqualOp>(a, b),
                    _ => Binary<NotEqualOp>(a, b),
                };
            case LogicalExpr logical:
                var p = Evaluate(logical.Left);
                var q = Evaluate(logical.Right);
                return logical.Operator == LogicalOperator.And ? Binary<AndOp>(p, q) : Binary<OrOp>(p, q);
            case NotExpr not:
                return Unary<NotOp>(Evaluate(not.Operand));
            case CallExpr call:
                return Call(call);
            default:
                throw ExpressionEvaluator.UnknownNode(node);
        }
    }

    private double[] Column(string name)
    {
        if (!_columns.TryGetValue(name, out var values))
        {
            values = _column(name)
                ?? throw new ArgumentException($"no values were supplied for column '{name}'", nameof(name));
            if (values.Length != _rows)
            {
                throw new ArgumentException(
                    $"column '{name}' has {values.Length} values, expected {_rows}",
                    nameof(name));
            }

            _columns.Add(name, values);
        }

        return values;
    }

    private Vec Call(CallExpr call)
    {
        ExpressionEvaluator.CheckArity(call);
        var first = Evaluate(call.Arguments[0]);
        switch (call.Function)
        {
            case FunctionName.Log:
                return Unary<LogOp>(first);
            case FunctionName.Exp:
                return Unary<ExpOp>(first);
            case FunctionName.Sqrt:
                return Unary<SqrtOp>(first);
            case FunctionName.Abs:
                return Unary<AbsOp>(first);
            default:
                var accumulated = first;
                for (var i = 1; i < call.Arguments.Count; i++)
                {
                    var next = Evaluate(call.Arguments[i]);
                    accumulated = call.Function == FunctionName.Min
                        ? Binary<MinOp>(accumulated, next)
                        : Binary<MaxOp>(accumulated, next);
                }

                return accumulated;
        }
    }

    private Vec Power(Vec x, Vec y)
    {
        if (y.Array is not null || x.Array is null)
        {
            return Binary<PowOp>(x, y);
        }

        // A constant exponent picks its loop once, not per row; the loops match Ops.Pow case for case.
        switch (y.Scalar)
        {
            case 0:
                if (x.IsOwned)
                {
                    _free.Push(x.Array);
                }

                return Vec.Of(1);
            case 1:
                return x;
            case 2:
                return Unary<SquareOp>(x);
            case 3:
                return Unary<CubeOp>(x);
            case 4:
                return Unary<FourthOp>(x);
            case -1:
                return Unary<ReciprocalOp>(x);
            case -2:
                return Unary<InverseSquareOp>(x);
            default:
                var exponent = y.Scalar;
                var result = x.IsOwned ? x.Array : Rent();
                var source = new ReadOnlySpan<double>(x.Array, 0, _rows);
                var target = result.AsSpan(0, source.Length);
                for (var i = 0; i < source.Length; i++)
                {
                    target[i] = Math.Pow(source[i], exponent);
                }

                return Vec.Owned(result);
        }
    }

    private Vec Unary<TOp>(Vec x)
        where TOp : struct, IUnaryOp
    {
        if (x.Array is null)
        {
            return Vec.Of(TOp.Apply(x.Scalar));
        }

        var result = x.IsOwned ? x.Array : Rent();
        var source = new ReadOnlySpan<double>(x.Array, 0, _rows);
        var target = result.AsSpan(0, source.Length);
        for (var i = 0; i < source.Length; i++)
        {
            target[i] = TOp.Apply(source[i]);
        }

        return Vec.Owned(result);
    }

    private Vec Binary<TOp>(Vec a, Vec b)
        where TOp : struct, IBinaryOp
    {
        if (a.Array is null && b.Array is null)
        {
            return Vec.Of(TOp.Apply(a.Scalar, b.Scalar));
        }

        // Writing element i only after reading element i makes the in-place reuse safe.
        var result = a.IsOwned ? a.Array! : b.IsOwned ? b.Array! : Rent();
        var target = result.AsSpan(0, _rows);
        if (a.Array is null)
        {
            var s = a.Scalar;
            var right = new ReadOnlySpan<double>(b.Array, 0, target.Length);
            for (var i = 0; i < right.Length; i++)
            {
                target[i] = TOp.Apply(s, right[i]);
            }
        }
        else if (b.Array is null)
        {
            var s = b.Scalar;
            var left = new ReadOnlySpan<double>(a.Array, 0, target.Length);
            for (var i = 0; i < left.Length; i++)
            {
                target[i] = TOp.Apply(left[i], s);
            }
        }
        else
        {
            var left = new ReadOnlySpan<double>(a.Array, 0, target.Length);
            var right = new ReadOnlySpan<double>(b.Array, 0, target.Length);
            for (var i = 0; i < left.Length; i++)
            {
                target[i] = TOp.Apply(left[i], right[i]);
            }
        }

        if (b.IsOwned && !ReferenceEquals(b.Array, result))
        {
            _free.Push(b.Array!);
        }

        return Vec.Owned(result);
    }

    private double[] Rent() => _free.Count > 0 ? _free.Pop() : new double[_rows];
}

/// <summary>A node's column-wise result: a scalar, or an array that is either ours to overwrite or borrowed.</summary>
internal readonly struct Vec
{
    private Vec(double scalar, double[]? array, bool owned)
    {
        Scalar = scalar;
        Array = array;
        IsOwned = owned;
    }

    internal double Scalar { get; }

    internal double[]? Array { get; }

    internal bool IsOwned { get; }

    internal static Vec Of(double scalar) => new(scalar, null, false);

    internal static Vec Owned(double[] array) => new(0, array, true);

    internal static Vec Borrowed(double[] array) => new(0, array, false);
}

internal interface IUnaryOp
{
    static abstract double Apply(double x);
}

internal interface IBinaryOp
{
    static abstract double Apply(double a, double b);
}

internal readonly struct NegateOp : IUnaryOp
{
    public static double Apply(double x) => -x;
}

internal readonly struct NotOp : IUnaryOp
{
    public static double Apply(double x) => Ops.Truth(x == 0);
}

internal readonly struct LogOp : IUnaryOp
{
    public static double Apply(double x) => Math.Log(x);
}

internal readonly struct ExpOp : IUnaryOp
{
    public static double Apply(double x) => Math.Exp(x);
}

internal readonly struct SqrtOp : IUnaryOp
{
    public static double Apply(double x) => Math.Sqrt(x);
}

internal readonly struct AbsOp : IUnaryOp
{
    public static double Apply(double x) => Math.Abs(x);
}

internal readonly struct SquareOp : IUnaryOp
{
    public static double Apply(double x) => Ops.Pow(x, 2);
}

internal readonly struct CubeOp : IUnaryOp
{
    public static double Apply(double x) => Ops.Pow(x, 3);
}

internal readonly struct FourthOp : IUnaryOp
{
    public static double Apply(double x) => Ops.Pow(x, 4);
}

internal readonly struct ReciprocalOp : IUnaryOp
{
    public static double Apply(double x) => Ops.Pow(x, -1);
}

internal readonly struct InverseSquareOp : IUnaryOp
{
    public static double Apply(double x) => Ops.Pow(x, -2);
}

internal readonly struct AddOp : IBinaryOp
{
    public static double Apply(double a, double b) => a + b;
}

internal readonly struct SubtractOp : IBinaryOp
{
    public static double Apply(double a, double b) => a - b;
}

internal readonly struct MultiplyOp : IBinaryOp
{
    public static double Apply(double a, double b) => a * b;
}

internal readonly struct DivideOp : IBinaryOp
{
    public static double Apply(double a, double b) => a / b;
}

internal readonly struct PowOp : IBinaryOp
{
    public static double Apply(double a, double b) => Ops.Pow(a, b);
}

internal readonly struct MinOp : IBinaryOp
{
    public static double Apply(double a, double b) => Math.Min(a, b);
}

internal readonly struct MaxOp : IBinaryOp
{
    public static double Apply(double a, double b) => Math.Max(a, b);
}

internal readonly struct LessOp : IBinaryOp
{
    public static double Apply(double a, double b) => Ops.Truth(a < b);
}

internal readonly struct LessOrEqualOp : IBinaryOp
{
    public static double Apply(double a, double b) => Ops.Truth(a <= b);
}

internal readonly struct GreaterOp : IBinaryOp
{
    public static double Apply(double a, double b) => Ops.Truth(a > b);
}

internal readonly struct GreaterOrEqualOp : IBinaryOp
{
    public static double Apply(double a, double b) => Ops.Truth(a >= b);
}

internal readonly struct EqualOp : IBinaryOp
{
    public static double Apply(double a, double b) => Ops.Truth(a == b);
}

internal readonly struct NotEqualOp : IBinaryOp
{
    public static double Apply(double a, double b) => Ops.Truth(a != b);
}

internal readonly struct AndOp : IBinaryOp
{
    public static double Apply(double a, double b) => Ops.Truth(a != 0 && b != 0);
}

internal readonly struct OrOp : IBinaryOp
{
    public static double Apply(double a, double b) => Ops.Truth(a != 0 || b != 0);
}
