using FitSpec.Spec;

namespace FitSpec.Lowering.Constraints;

/// <summary>
/// increasing/decreasing in an input over a range: the first derivative of the fitted curve is ≥ 0 (≤ 0) at
/// grid points that include both ends — exact when the derivative is linear in the input (degree ≤ 2).
/// The verification re-checks a ten times finer grid.
/// </summary>
internal sealed class ShapeUnit : IConstraintUnit
{
    public const int DefaultGrid = 101;

    public bool Handles(ConstraintSpec constraint) => constraint is ShapeConstraint { Shape: ShapeKind.Increasing or ShapeKind.Decreasing };

    public void Lower(LoweringContext context, ConstraintSpec constraint, int index)
    {
        var c = (ShapeConstraint)constraint;
        var input = c.Input.Value;
        if (!context.Design.Inputs.Contains(input))
        {
            var hint = Diagnostics.NameSuggester.Hint(input, context.Design.Inputs);
            context.Error(c.Input.Pos, "constraints.in", $"'{input}' is not an input of the model{hint}; inputs are: {string.Join(", ", context.Design.Inputs)}");
            return;
        }

        if (PointInputs.Complete(context, c, c.At, input, c.From) is not { } point)
        {
            return;
        }

        var grid = c.Grid ?? DefaultGrid;
        var rows = new List<int>();
        var sign = c.Shape == ShapeKind.Increasing ? 1.0 : -1.0;
        var origin = new Origin(OriginKind.Constraint, index);
        for (var k = 0; k < grid; k++)
        {
            point[input] = GridPoint(c.From, c.To, grid, k);
            var slope = context.Design.Basis.At(point, input).Select(j => sign * j.D1).ToArray();
            rows.Add(context.Builder.AddRow($"c{index + 1}_g{k + 1}", 0, double.PositiveInfinity, context.Internal(slope), origin));
        }

        var at = new Dictionary<string, double>(point, StringComparer.Ordinal);
        at.Remove(input);
        var description = $"derivative {(sign > 0 ? ">=" : "<=")} 0 at {grid} equally spaced points of [{c.From}, {c.To}] (both ends included)";
        context.Constraints.Add(new LoweredConstraint(index, c, rows, [], description, new ShapeCheck(c.Shape, input, c.From, c.To, grid, at)));
        context.Notes.Add(new LoweringNote($"constraint {index + 1}", c.Label, $"{grid} rows: {description}"));
    }

    public static double GridPoint(double from, double to, int count, int k) =>
        k == count - 1 ? to : from + (to - from) * k / (count - 1);
}
