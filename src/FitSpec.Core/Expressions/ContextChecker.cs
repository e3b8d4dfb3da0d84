namespace FitSpec.Expressions;

/// <summary>
/// Checks a parsed tree against its context: numbers where numbers are needed, conditions where conditions
/// are needed, comparisons only where the context allows them. Runs after parsing so the grammar stays one.
/// </summary>
internal sealed class ContextChecker
{
    private readonly ExpressionContext _context;
    private readonly List<ExprError> _errors;

    internal ContextChecker(ExpressionContext context, List<ExprError> errors)
    {
        _context = context;
        _errors = errors;
    }

    internal void CheckRoot(Expr root)
    {
        switch (_context)
        {
            case ExpressionContext.Filter:
                CheckCondition(root, "a filter must be a condition such as 'x > 0'");
                break;
            case ExpressionContext.Relation:
                CheckRelation(root);
                break;
            default:
                CheckValue(root);
                break;
        }
    }

    private void CheckRelation(Expr root)
    {
        switch (root)
        {
            case ComparisonExpr comparison:
                CheckValue(comparison.Left);
                CheckValue(comparison.Right);
                break;
            case LogicalExpr logical:
                Add(
                    logical.OperatorStart,
                    logical.OperatorLength,
                    $"'{ExprFormatter.Symbol(logical.Operator)}' is not allowed in a constraint; write each constraint separately");
                break;
            case NotExpr not:
                Add(not.Start, 3, "'not' is not allowed in a constraint");
                break;
            default:
                Add(root.Start, root.Length, "a constraint must be a comparison such as 'b1 >= 0'");
                CheckValue(root);
                break;
        }
    }

    /// <summary>The node must yield a number; an offending node is reported once and not descended into.</summary>
    private void CheckValue(Expr node)
    {
        switch (node)
        {
            case NumberExpr or ColumnExpr:
                break;
            case UnaryExpr unary:
                CheckValue(unary.Operand);
                break;
            case BinaryExpr binary:
                CheckValue(binary.Left);
                CheckValue(binary.Right);
                break;
            case CallExpr call:
                foreach (var argument in call.Arguments)
                {
                    CheckValue(argument);
                }

                break;
            case ComparisonExpr comparison:
                ConditionAsValue(
                    node,
                    comparison.OperatorStart,
                    comparison.OperatorLength,
                    "comparisons are only allowed in a filter",
                    "only one comparison is allowed in a constraint");
                break;
            case LogicalExpr logical:
                var symbol = ExprFormatter.Symbol(logical.Operator);
                ConditionAsValue(
                    node,
                    logical.OperatorStart,
                    logical.OperatorLength,
                    $"'{symbol}' is only allowed in a filter",
                    $"'{symbol}' is not allowed in a constraint");
                break;
            case NotExpr not:
                ConditionAsValue(node, not.Start, 3, "'not' is only allowed in a filter", "'not' is not allowed in a constraint");
                break;
        }
    }

    private void ConditionAsValue(Expr node, int operatorStart, int operatorLength, string valueMessage, string relationMessage)
    {
        switch (_context)
        {
            case ExpressionContext.Filter:
                Add(node.Start, node.Length, "a condition cannot be used as a number; conditions only combine with 'and', 'or', 'not'");
                break;
            case ExpressionContext.Relation:
                Add(operatorStart, operatorLength, relationMessage);
                break;
            default:
                Add(operatorStart, operatorLength, valueMessage);
                break;
        }
    }

    /// <summary>The node must be a condition (filters only).</summary>
    private void CheckCondition(Expr node, string message)
    {
        switch (node)
        {
            case ComparisonExpr comparison:
                CheckValue(comparison.Left);
                CheckValue(comparison.Right);
                break;
            case LogicalExpr logical:
                var need = $"'{ExprFormatter.Symbol(logical.Operator)}' needs a condition on each side, such as 'x > 0'";
                CheckCondition(logical.Left, need);
                CheckCondition(logical.Right, need);
                break;
            case NotExpr not:
                CheckCondition(not.Operand, "'not' needs a condition, such as 'not x > 0'");
                break;
            default:
                Add(node.Start, node.Length, message);
                CheckValue(node);
                break;
        }
    }

    private void Add(int start, int length, string message) => _errors.Add(new ExprError(start, length, message));
}
