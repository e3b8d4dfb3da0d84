namespace FitSpec.Expressions;

/// <summary>Where an expression is used; decides whether comparisons and logic are allowed.</summary>
public enum ExpressionContext
{
    /// <summary>A number per row (a term, a transform): no comparisons, no logic.</summary>
    Value,

    /// <summary>A row condition: the result must be a comparison or a logical combination of comparisons.</summary>
    Filter,

    /// <summary>Like <see cref="Value"/> on both sides of exactly one top-level comparison (constraints).</summary>
    Relation,
}

public enum UnaryOperator
{
    Negate,
    Plus,
}

public enum BinaryOperator
{
    Add,
    Subtract,
    Multiply,
    Divide,
    Power,
}

public enum ComparisonOperator
{
    Less,
    LessOrEqual,
    Greater,
    GreaterOrEqual,
    Equal,
    NotEqual,
}

public enum LogicalOperator
{
    And,
    Or,
}

/// <summary>The only functions the language has; log is the natural logarithm.</summary>
public enum FunctionName
{
    Log,
    Exp,
    Sqrt,
    Abs,
    Min,
    Max,
}

/// <summary>
/// An immutable expression node. Start and Length locate the node in the source text (0-based), including any
/// parentheses written around it, so errors can point at exactly what the user wrote.
/// </summary>
public abstract record Expr(int Start, int Length)
{
    internal int End => Start + Length;

    /// <summary>A fully parenthesised rendering, so the tree's grouping is visible.</summary>
    public sealed override string ToString() => ExprFormatter.Format(this);
}

public sealed record NumberExpr(double Value, int Start, int Length) : Expr(Start, Length);

public sealed record ColumnExpr(string Name, int Start, int Length) : Expr(Start, Length);

public sealed record UnaryExpr(UnaryOperator Operator, Expr Operand, int Start, int Length) : Expr(Start, Length);

public sealed record BinaryExpr(BinaryOperator Operator, Expr Left, Expr Right, int Start, int Length)
    : Expr(Start, Length)
{
    /// <summary>Offset of the operator symbol, for errors that concern the operation itself.</summary>
    internal int OperatorStart { get; init; }
}

public sealed record ComparisonExpr(ComparisonOperator Operator, Expr Left, Expr Right, int Start, int Length)
    : Expr(Start, Length)
{
    internal int OperatorStart { get; init; }

    internal int OperatorLength => ExprFormatter.Symbol(Operator).Length;
}

public sealed record LogicalExpr(LogicalOperator Operator, Expr Left, Expr Right, int Start, int Length)
    : Expr(Start, Length)
{
    internal int OperatorStart { get; init; }

    internal int OperatorLength => ExprFormatter.Symbol(Operator).Length;
}

public sealed record NotExpr(Expr Operand, int Start, int Length) : Expr(Start, Length);

public sealed record CallExpr(FunctionName Function, IReadOnlyList<Expr> Arguments, int Start, int Length)
    : Expr(Start, Length)
{
    // The generated equality would compare the argument list by reference; trees are compared by content.
    public bool Equals(CallExpr? other) =>
        other is not null
        && Function == other.Function
        && Start == other.Start
        && Length == other.Length
        && Arguments.SequenceEqual(other.Arguments);

    public override int GetHashCode()
    {
        var hash = new HashCode();
        hash.Add(Function);
        hash.Add(Start);
        hash.Add(Length);
        foreach (var argument in Arguments)
        {
            hash.Add(argument);
        }

        return hash.ToHashCode();
    }
}

/// <summary>One problem in an expression; Offset and Length are 0-based into the expression text.</summary>
public sealed record ExprError(int Offset, int Length, string Message);
