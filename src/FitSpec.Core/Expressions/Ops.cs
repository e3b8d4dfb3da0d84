using System.Runtime.CompilerServices;

namespace FitSpec.Expressions;

/// <summary>Scalar semantics shared by every evaluator, so column-wise, scalar and jet values agree exactly.</summary>
internal static class Ops
{
    /// <summary>Small integer exponents multiply (exact for squares, and fast); the rest use Math.Pow.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    internal static double Pow(double x, double y) => y switch
    {
        0 => 1,
        1 => x,
        2 => x * x,
        3 => x * x * x,
        4 => Square(x * x),
        -1 => 1 / x,
        -2 => 1 / (x * x),
        _ => Math.Pow(x, y),
    };

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    internal static double Truth(bool condition) => condition ? 1.0 : 0.0;

    internal static double Compare(ComparisonOperator op, double a, double b) => op switch
    {
        ComparisonOperator.Less => Truth(a < b),
        ComparisonOperator.LessOrEqual => Truth(a <= b),
        ComparisonOperator.Greater => Truth(a > b),
        ComparisonOperator.GreaterOrEqual => Truth(a >= b),
        ComparisonOperator.Equal => Truth(a == b),
        _ => Truth(a != b),
    };

    internal static double Logic(LogicalOperator op, double a, double b) =>
        op == LogicalOperator.And ? Truth(a != 0 && b != 0) : Truth(a != 0 || b != 0);

    internal static double Apply(FunctionName function, double x) => function switch
    {
        FunctionName.Log => Math.Log(x),
        FunctionName.Exp => Math.Exp(x),
        FunctionName.Sqrt => Math.Sqrt(x),
        FunctionName.Abs => Math.Abs(x),
        _ => throw new ArgumentOutOfRangeException(nameof(function), function, "not a one-argument function"),
    };

    internal static double Arithmetic(BinaryOperator op, double a, double b) => op switch
    {
        BinaryOperator.Add => a + b,
        BinaryOperator.Subtract => a - b,
        BinaryOperator.Multiply => a * b,
        BinaryOperator.Divide => a / b,
        _ => Pow(a, b),
    };

    private static double Square(double x) => x * x;
}
