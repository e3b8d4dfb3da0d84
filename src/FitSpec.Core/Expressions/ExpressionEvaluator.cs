using System.Runtime.CompilerServices;

namespace FitSpec.Expressions;

/// <summary>
/// Evaluates parsed trees. Conditions yield 1.0 (true) or 0.0 (false). Arithmetic is plain IEEE (log(-1) is NaN,
/// 1/0 is infinity, comparisons with NaN are false except '!='); callers check finiteness.
/// </summary>
public static class ExpressionEvaluator
{
    /// <summary>
    /// Column-wise evaluation: every node is computed over whole arrays. <paramref name="column"/> must return an
    /// array of exactly <paramref name="rowCount"/> values and is asked once per distinct name. The arrays are
    /// never written to; when the expression is a bare column, that column's own array is returned, so treat the
    /// result as read-only.
    /// </summary>
    public static double[] Evaluate(Expr root, Func<string, double[]> column, int rowCount)
    {
        ArgumentNullException.ThrowIfNull(root);
        ArgumentNullException.ThrowIfNull(column);
        ArgumentOutOfRangeException.ThrowIfNegative(rowCount);
        var result = new ColumnEvaluator(column, rowCount).Evaluate(root);
        return result.Array ?? Filled(result.Scalar, rowCount);
    }

    public static double EvaluateScalar(Expr root, Func<string, double> value)
    {
        ArgumentNullException.ThrowIfNull(root);
        ArgumentNullException.ThrowIfNull(value);
        return Scalar(root, value);
    }

    /// <summary>
    /// Value, first and second derivative with respect to one variable; <paramref name="value"/> gives each
    /// column's jet (typically <see cref="Jet.Variable"/> for the variable, <see cref="Jet.Constant"/> otherwise).
    /// Conditions give constant jets of 1 or 0.
    /// </summary>
    public static Jet EvaluateJet(Expr root, Func<string, Jet> value)
    {
        ArgumentNullException.ThrowIfNull(root);
        ArgumentNullException.ThrowIfNull(value);
        return JetOf(root, value);
    }

    private static double[] Filled(double value, int count)
    {
        var array = new double[count];
        Array.Fill(array, value);
        return array;
    }

    private static double Scalar(Expr node, Func<string, double> value)
    {
        // Trees from the parser are shallow enough; a hand-built one gets an exception instead of a crash.
        RuntimeHelpers.EnsureSufficientExecutionStack();
        switch (node)
        {
            case NumberExpr number:
                return number.Value;
            case ColumnExpr column:
                return value(column.Name);
            case UnaryExpr unary:
                var operand = Scalar(unary.Operand, value);
                return unary.Operator == UnaryOperator.Negate ? -operand : operand;
            case BinaryExpr binary:
                return Ops.Arithmetic(binary.Operator, Scalar(binary.Left, value), Scalar(binary.Right, value));
            case ComparisonExpr comparison:
                return Ops.Compare(comparison.Operator, Scalar(comparison.Left, value), Scalar(comparison.Right, value));
            case LogicalExpr logical:
                return Ops.Logic(logical.Operator, Scalar(logical.Left, value), Scalar(logical.Right, value));
            case NotExpr not:
                return Ops.Truth(Scalar(not.Operand, value) == 0);
            case CallExpr call when call.Function is FunctionName.Min or FunctionName.Max:
                CheckArity(call);
                var accumulated = Scalar(call.Arguments[0], value);
                for (var i = 1; i < call.Arguments.Count; i++)
                {
                    var next = Scalar(call.Arguments[i], value);
                    accumulated = call.Function == FunctionName.Min ? Math.Min(accumulated, next) : Math.Max(accumulated, next);
                }

                return accumulated;
            case CallExpr call:
                CheckArity(call);
                return Ops.Apply(call.Function, Scalar(call.Arguments[0], value));
            default:
                throw UnknownNode(node);
        }
    }

    private static Jet JetOf(Expr node, Func<string, Jet> value)
    {
        RuntimeHelpers.EnsureSufficientExecutionStack();
        switch (node)
        {
            case NumberExpr number:
                return Jet.Constant(number.Value);
            case ColumnExpr column:
                return value(column.Name);
            case UnaryExpr unary:
                var operand = JetOf(unary.Operand, value);
                return unary.Operator == UnaryOperator.Negate ? -operand : operand;
            case BinaryExpr binary:
                var left = JetOf(binary.Left, value);
                var right = JetOf(binary.Right, value);
                return binary.Operator switch
                {
                    BinaryOperator.Add => left + right,
                    BinaryOperator.Subtract => left - right,
                    BinaryOperator.Multiply => left * right,
                    BinaryOperator.Divide => left / right,
                    _ => Jet.Pow(left, right),
                };
            case ComparisonExpr comparison:
                return Jet.Constant(Ops.Compare(
                    comparison.Operator,
                    JetOf(comparison.Left, value).Value,
                    JetOf(comparison.Right, value).Value));
            case LogicalExpr logical:
                return Jet.Constant(Ops.Logic(
                    logical.Operator,
                    JetOf(logical.Left, value).Value,
                    JetOf(logical.Right, value).Value));
            case NotExpr not:
                return Jet.Constant(Ops.Truth(JetOf(not.Operand, value).Value == 0));
            case CallExpr call when call.Function is FunctionName.Min or FunctionName.Max:
                CheckArity(call);
                var accumulated = JetOf(call.Arguments[0], value);
                for (var i = 1; i < call.Arguments.Count; i++)
                {
                    var next = JetOf(call.Arguments[i], value);
                    accumulated = call.Function == FunctionName.Min ? Jet.Min(accumulated, next) : Jet.Max(accumulated, next);
                }

                return accumulated;
            case CallExpr call:
                CheckArity(call);
                var argument = JetOf(call.Arguments[0], value);
                return call.Function switch
                {
                    FunctionName.Log => Jet.Log(argument),
                    FunctionName.Exp => Jet.Exp(argument),
                    FunctionName.Sqrt => Jet.Sqrt(argument),
                    _ => Jet.Abs(argument),
                };
            default:
                throw UnknownNode(node);
        }
    }

    internal static void CheckArity(CallExpr call)
    {
        var count = call.Arguments.Count;
        var ok = call.Function is FunctionName.Min or FunctionName.Max ? count >= 2 : count == 1;
        if (!ok)
        {
            throw new ArgumentException(
                $"'{ExprFormatter.Name(call.Function)}' called with {count} arguments; the tree was not built by the parser",
                nameof(call));
        }
    }

    internal static ArgumentException UnknownNode(Expr node) =>
        new($"unsupported expression node {node.GetType().Name}", nameof(node));
}
