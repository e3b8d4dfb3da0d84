using FitSpec.Diagnostics;
using FitSpec.Expressions;
using FitSpec.Spec;

namespace FitSpec.Lowering.Constraints;

/// <summary>"b0 + 2*b2 <= 1": one row over β (rewritten over θ).</summary>
internal sealed class RelationUnit : IConstraintUnit
{
    public bool Handles(ConstraintSpec constraint) => constraint is RelationConstraint;

    public void Lower(LoweringContext context, ConstraintSpec constraint, int index)
    {
        var c = (RelationConstraint)constraint;
        var (relation, errors) = Linearizer.Linearize(c.Text.Value);
        foreach (var e in errors)
        {
            context.Error(c.Text.At(e.Offset), "constraints", $"in '{c.Text.Value}': {e.Message}");
        }

        if (relation is null)
        {
            return;
        }

        var coefficients = context.Design.Coefficients;
        var raw = new double[coefficients.Count];
        foreach (var (name, value) in relation.Terms)
        {
            var j = IndexOf(coefficients, name);
            if (j < 0)
            {
                var hint = NameSuggester.Hint(name, coefficients.Select(x => x.Name));
                context.Error(c.Text.Pos, "constraints", $"in '{c.Text.Value}': unknown coefficient '{name}'{hint}; coefficients are: {string.Join(", ", coefficients.Select(x => x.Name))}");
                return;
            }

            raw[j] += value;
        }

        var (lower, upper) = relation.Operator switch
        {
            RelationOperator.LessOrEqual => (double.NegativeInfinity, relation.Constant),
            RelationOperator.GreaterOrEqual => (relation.Constant, double.PositiveInfinity),
            _ => (relation.Constant, relation.Constant),
        };
        var row = context.Builder.AddRow($"c{index + 1}", lower, upper, context.Internal(raw), new Origin(OriginKind.Constraint, index));
        context.Constraints.Add(new LoweredConstraint(index, c, [row], [], null, null)
        {
            Relation = relation,
            IsEquality = relation.Operator == RelationOperator.Equal,
        });
        context.Notes.Add(new LoweringNote($"constraint {index + 1}", c.Label, "1 linear row"));
    }

    private static int IndexOf(IReadOnlyList<Design.Coefficient> coefficients, string name)
    {
        for (var j = 0; j < coefficients.Count; j++)
        {
            if (coefficients[j].Name == name)
            {
                return j;
            }
        }

        return -1;
    }
}
