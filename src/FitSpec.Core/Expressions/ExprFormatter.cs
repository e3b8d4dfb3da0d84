using System.Globalization;
using System.Text;

namespace FitSpec.Expressions;

/// <summary>Renders a tree back to source form, parenthesising every operation so grouping is explicit.</summary>
internal static class ExprFormatter
{
    internal static string Format(Expr root)
    {
        var builder = new StringBuilder();
        Write(builder, root, outermost: true);
        return builder.ToString();
    }

    internal static string Symbol(BinaryOperator op) => op switch
    {
        BinaryOperator.Add => "+",
        BinaryOperator.Subtract => "-",
        BinaryOperator.Multiply => "*",
        BinaryOperator.Divide => "/",
        _ => "^",
    };

    internal static string Symbol(ComparisonOperator op) => op switch
    {
        ComparisonOperator.Less => "<",
        ComparisonOperator.LessOrEqual => "<=",
        ComparisonOperator.Greater => ">",
        ComparisonOperator.GreaterOrEqual => ">=",
        ComparisonOperator.Equal => "==",
        _ => "!=",
    };

    internal static string Symbol(LogicalOperator op) => op == LogicalOperator.And ? "and" : "or";

    internal static string Name(FunctionName function) => function switch
    {
        FunctionName.Log => "log",
        FunctionName.Exp => "exp",
        FunctionName.Sqrt => "sqrt",
        FunctionName.Abs => "abs",
        FunctionName.Min => "min",
        _ => "max",
    };

    internal static string Number(double value) => value.ToString("R", CultureInfo.InvariantCulture);

    private static void Write(StringBuilder builder, Expr node, bool outermost)
    {
        switch (node)
        {
            case NumberExpr number:
                builder.Append(Number(number.Value));
                break;
            case ColumnExpr column:
                builder.Append(Lexer.Quote(column.Name));
                break;
            case UnaryExpr unary:
                Open(builder, outermost);
                builder.Append(unary.Operator == UnaryOperator.Negate ? '-' : '+');
                Write(builder, unary.Operand, false);
                Close(builder, outermost);
                break;
            case NotExpr not:
                Open(builder, outermost);
                builder.Append("not ");
                Write(builder, not.Operand, false);
                Close(builder, outermost);
                break;
            case BinaryExpr binary:
                Infix(builder, binary.Left, Symbol(binary.Operator), binary.Right, outermost);
                break;
            case ComparisonExpr comparison:
                Infix(builder, comparison.Left, Symbol(comparison.Operator), comparison.Right, outermost);
                break;
            case LogicalExpr logical:
                Infix(builder, logical.Left, Symbol(logical.Operator), logical.Right, outermost);
                break;
            case CallExpr call:
                builder.Append(Name(call.Function)).Append('(');
                for (var i = 0; i < call.Arguments.Count; i++)
                {
                    if (i > 0)
                    {
                        builder.Append(", ");
                    }

                    Write(builder, call.Arguments[i], true);
                }

                builder.Append(')');
                break;
            default:
                builder.Append('?');
                break;
        }
    }

    private static void Infix(StringBuilder builder, Expr left, string symbol, Expr right, bool outermost)
    {
        Open(builder, outermost);
        Write(builder, left, false);
        builder.Append(' ').Append(symbol).Append(' ');
        Write(builder, right, false);
        Close(builder, outermost);
    }

    private static void Open(StringBuilder builder, bool outermost)
    {
        if (!outermost)
        {
            builder.Append('(');
        }
    }

    private static void Close(StringBuilder builder, bool outermost)
    {
        if (!outermost)
        {
            builder.Append(')');
        }
    }
}
