using FitSpec.Design;
using FitSpec.Spec;

namespace FitSpec.Lowering.Constraints;

/// <summary>|y_i - f(x_i)| ≤ a for every row (unweighted): one ranged row per observation.</summary>
internal sealed class ResidualsUnit : IConstraintUnit
{
    public bool Handles(ConstraintSpec constraint) => constraint is ResidualsConstraint;

    public void Lower(LoweringContext context, ConstraintSpec constraint, int index)
    {
        var c = (ResidualsConstraint)constraint;
        var design = context.Design;
        var entries = new Entry[design.P];
        var rows = new List<int>(design.Rows);
        var origin = new Origin(OriginKind.Constraint, index);
        for (var i = 0; i < design.Rows; i++)
        {
            for (var j = 0; j < design.P; j++)
            {
                entries[j] = new Entry(j, design.X[j][i]);
            }

            rows.Add(context.Builder.AddRow($"c{index + 1}_r{i + 1}", design.Y[i] - c.MaxAbs, design.Y[i] + c.MaxAbs, entries, origin));
        }

        context.Constraints.Add(new LoweredConstraint(index, c, rows, [], null, null));
        context.Notes.Add(new LoweringNote($"constraint {index + 1}", c.Label, $"{design.Rows} ranged rows"));
    }
}
