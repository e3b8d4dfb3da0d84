using System.Text;

namespace FitSpec.Expressions;

public enum RelationOperator
{
    LessOrEqual,
    GreaterOrEqual,
    Equal,
}

/// <summary>
/// A linear constraint Σ coefficient·name (op) Constant: names on the left (combined, in order of first
/// appearance, none with a zero coefficient), numbers on the right.
/// </summary>
public sealed record LinearRelation(IReadOnlyList<KeyValuePair<string, double>> Terms, RelationOperator Operator, double Constant)
{
    // Compared by content: the generated equality would compare the term list by reference.
    public bool Equals(LinearRelation? other) =>
        other is not null
        && Operator == other.Operator
        && Constant.Equals(other.Constant)
        && Terms.SequenceEqual(other.Terms);

    public override int GetHashCode() => HashCode.Combine(Operator, Constant, Terms.Count);

    /// <summary>Source form, e.g. "b1 - 2*b2 <= 1".</summary>
    public override string ToString()
    {
        var builder = new StringBuilder();
        foreach (var (name, coefficient) in Terms)
        {
            var magnitude = Math.Abs(coefficient);
            if (builder.Length == 0)
            {
                builder.Append(coefficient < 0 ? "-" : "");
            }
            else
            {
                builder.Append(coefficient < 0 ? " - " : " + ");
            }

            if (magnitude != 1)
            {
                builder.Append(ExprFormatter.Number(magnitude)).Append('*');
            }

            builder.Append(Lexer.Quote(name));
        }

        var symbol = Operator switch
        {
            RelationOperator.LessOrEqual => "<=",
            RelationOperator.GreaterOrEqual => ">=",
            _ => "==",
        };
        return builder.Append(' ').Append(symbol).Append(' ').Append(ExprFormatter.Number(Constant)).ToString();
    }
}

/// <summary>Turns a constraint's text into a <see cref="LinearRelation"/>; never throws.</summary>
public static class Linearizer
{
    public static (LinearRelation? Relation, IReadOnlyList<ExprError> Errors) Linearize(string text)
    {
        var parsed = ExpressionParser.Parse(text, ExpressionContext.Relation);
        if (!parsed.Ok || parsed.Root is not ComparisonExpr comparison)
        {
            return (null, parsed.Errors);
        }

        text = parsed.Text;
        var errors = new List<ExprError>();
        RelationOperator? op = comparison.Operator switch
        {
            ComparisonOperator.LessOrEqual => RelationOperator.LessOrEqual,
            ComparisonOperator.GreaterOrEqual => RelationOperator.GreaterOrEqual,
            ComparisonOperator.Equal => RelationOperator.Equal,
            _ => null,
        };
        if (op is null)
        {
            var message = comparison.Operator switch
            {
                ComparisonOperator.Less => "'<' is not allowed in a constraint (use '<=')",
                ComparisonOperator.Greater => "'>' is not allowed in a constraint (use '>=')",
                _ => "'!=' is not allowed in a constraint (use '<=', '>=' or '==')",
            };
            errors.Add(new ExprError(comparison.OperatorStart, comparison.OperatorLength, message));
        }

        var walker = new AffineWalker(text, errors);
        var left = walker.Walk(comparison.Left);
        var right = walker.Walk(comparison.Right);
        if (errors.Count > 0 || op is not { } relationOperator || left is null || right is null)
        {
            return (null, Ordered(errors));
        }

        // Names usually sit on the left; "3 <= b1" is read as "b1 >= 3" rather than "-b1 <= -3".
        Affine names;
        double constant;
        if (!left.HasNames && right.HasNames)
        {
            names = right;
            constant = left.Constant - right.Constant;
            relationOperator = relationOperator switch
            {
                RelationOperator.LessOrEqual => RelationOperator.GreaterOrEqual,
                RelationOperator.GreaterOrEqual => RelationOperator.LessOrEqual,
                _ => RelationOperator.Equal,
            };
        }
        else
        {
            constant = right.Constant - left.Constant;
            names = left;
            names.AddScaled(right, -1);
        }

        var terms = names.Terms.Where(t => t.Value != 0).ToArray();
        if (terms.Length == 0)
        {
            var message = names.Terms.Count == 0 && right.Terms.Count == 0
                ? "a constraint must mention at least one coefficient"
                : "the coefficients cancel out, so the constraint does not depend on any coefficient";
            return (null, [new ExprError(0, text.Length, message)]);
        }

        if (!double.IsFinite(constant) || terms.Any(t => !double.IsFinite(t.Value)))
        {
            return (null, [new ExprError(0, text.Length, "the constraint's numbers are too large (not finite)")]);
        }

        // Adding +0.0 turns a -0 constant into 0, so "b1 <= -0" and "b1 <= 0" are the same relation.
        return (new LinearRelation(terms, relationOperator, constant + 0.0), []);
    }

    private static ExprError[] Ordered(List<ExprError> errors) => errors.OrderBy(e => e.Offset).ToArray();

    /// <summary>An affine form Σ c·name + Constant, built bottom-up. Each walk result is fresh, so it may be mutated.</summary>
    private sealed class Affine
    {
        private readonly Dictionary<string, int> _index = new(StringComparer.Ordinal);

        internal List<KeyValuePair<string, double>> Terms { get; } = [];

        internal double Constant { get; private set; }

        /// <summary>True when some name survives with a non-zero coefficient.</summary>
        internal bool HasNames => Terms.Exists(t => t.Value != 0);

        internal static Affine OfConstant(double value) => new() { Constant = value };

        internal static Affine OfName(string name)
        {
            var affine = new Affine();
            affine.AddTerm(name, 1);
            return affine;
        }

        internal void AddScaled(Affine other, double factor)
        {
            foreach (var (name, coefficient) in other.Terms)
            {
                AddTerm(name, coefficient * factor);
            }

            Constant += other.Constant * factor;
        }

        internal void Scale(double factor)
        {
            for (var i = 0; i < Terms.Count; i++)
            {
                Terms[i] = new(Terms[i].Key, Terms[i].Value * factor);
            }

            Constant *= factor;
        }

        // Dividing rather than multiplying by the reciprocal keeps 'b1/3' and '(2*b1)/3' exactly rounded.
        internal void Divide(double divisor)
        {
            for (var i = 0; i < Terms.Count; i++)
            {
                Terms[i] = new(Terms[i].Key, Terms[i].Value / divisor);
            }

            Constant /= divisor;
        }

        internal void SetConstant(double value) => Constant = value;

        private void AddTerm(string name, double coefficient)
        {
            if (_index.TryGetValue(name, out var at))
            {
                Terms[at] = new(name, Terms[at].Value + coefficient);
            }
            else
            {
                _index.Add(name, Terms.Count);
                Terms.Add(new(name, coefficient));
            }
        }
    }

    /// <summary>Walks one side of the relation; null means an error was recorded below, and stays silent above.</summary>
    private sealed class AffineWalker
    {
        private readonly string _text;
        private readonly List<ExprError> _errors;

        internal AffineWalker(string text, List<ExprError> errors)
        {
            _text = text;
            _errors = errors;
        }

        internal Affine? Walk(Expr node)
        {
            switch (node)
            {
                case NumberExpr number:
                    return Affine.OfConstant(number.Value);
                case ColumnExpr column:
                    return Affine.OfName(column.Name);
                case UnaryExpr unary:
                    var operand = Walk(unary.Operand);
                    if (unary.Operator == UnaryOperator.Negate)
                    {
                        operand?.Scale(-1);
                    }

                    return operand;
                case BinaryExpr binary:
                    return Binary(binary);
                case CallExpr call:
                    Error(call, "functions are not allowed in a linear constraint");
                    return null;
                default:
                    // The parser's relation check lets only one top-level comparison through.
                    Error(node, "conditions are not allowed inside a constraint");
                    return null;
            }
        }

        private Affine? Binary(BinaryExpr binary)
        {
            var left = Walk(binary.Left);
            var right = Walk(binary.Right);
            if (left is null || right is null)
            {
                return null;
            }

            switch (binary.Operator)
            {
                case BinaryOperator.Add:
                    left.AddScaled(right, 1);
                    return left;
                case BinaryOperator.Subtract:
                    left.AddScaled(right, -1);
                    return left;
                case BinaryOperator.Multiply:
                    if (!left.HasNames)
                    {
                        right.Scale(left.Constant);
                        return right;
                    }

                    if (!right.HasNames)
                    {
                        left.Scale(right.Constant);
                        return left;
                    }

                    Error(binary, $"'{Source(binary)}' is not linear: a product of two coefficients");
                    return null;
                case BinaryOperator.Divide:
                    if (right.HasNames)
                    {
                        Error(binary.Right, "division by a coefficient is not linear");
                        return null;
                    }

                    if (right.Constant == 0)
                    {
                        Error(binary.Right, "division by zero");
                        return null;
                    }

                    left.Divide(right.Constant);
                    return left;
                default:
                    if (left.HasNames || right.HasNames)
                    {
                        var why = left.HasNames ? "a power of a coefficient" : "a coefficient in an exponent";
                        Error(binary, $"'{Source(binary)}' is not linear: {why}");
                        return null;
                    }

                    left.SetConstant(Ops.Pow(left.Constant, right.Constant));
                    return left;
            }
        }

        private string Source(Expr node) => _text.Substring(node.Start, node.Length);

        private void Error(Expr node, string message) => _errors.Add(new ExprError(node.Start, node.Length, message));
    }
}
