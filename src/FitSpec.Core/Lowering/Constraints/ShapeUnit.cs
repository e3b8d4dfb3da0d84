using FitSpec.Spec;

namespace FitSpec.Lowering.Constraints;

/// <summary>
/// increasing/decreasing (convex/concave) in an input over a range. Where one spline in that very column is
/// the only term depending on it, through the spline's coefficients (<see cref="SplineShape"/>: a sufficient
/// condition over the whole range). Otherwise the first (second) derivative of the fitted curve is ≥ 0 (≤ 0)
/// at grid points that include both ends — exact when that derivative is linear in the input (a polynomial
/// of degree ≤ 2 for monotone, ≤ 3 for convex/concave). The verification re-checks a ten times finer grid.
/// </summary>
internal sealed class ShapeUnit : IConstraintUnit
{
    public const int DefaultGrid = 101;

    public bool Handles(ConstraintSpec constraint) => constraint is ShapeConstraint;

    /// <summary>Which derivative the shape is about.</summary>
    public static int Order(ShapeKind kind) => kind is ShapeKind.Convex or ShapeKind.Concave ? 2 : 1;

    /// <summary>+1 when that derivative must be ≥ 0, -1 when ≤ 0.</summary>
    public static double Sign(ShapeKind kind) => kind is ShapeKind.Increasing or ShapeKind.Convex ? 1.0 : -1.0;

    public void Lower(LoweringContext context, ConstraintSpec constraint, int index)
    {
        var c = (ShapeConstraint)constraint;
        var input = c.Input.Value;
        var design = context.Design;
        if (!design.Inputs.Contains(input))
        {
            var hint = Diagnostics.NameSuggester.Hint(input, design.Inputs);
            context.Error(c.Input.Pos, "constraints.in", $"'{input}' is not an input of the model{hint}; inputs are: {string.Join(", ", design.Inputs)}");
            return;
        }

        if (PointInputs.Complete(context, c, c.At, input, c.From) is not { } point)
        {
            return;
        }

        var order = Order(c.Shape);
        var sign = Sign(c.Shape);
        var kind = c.Shape.ToString().ToLowerInvariant();
        var what = order == 1 ? "derivative" : "second derivative";
        var relation = sign > 0 ? ">=" : "<=";
        var grid = c.Grid ?? DefaultGrid;
        var at = new Dictionary<string, double>(point, StringComparer.Ordinal);
        at.Remove(input);
        var check = new ShapeCheck(c.Shape, input, c.From, c.To, grid, at);
        var origin = new Origin(OriginKind.Constraint, index);
        var rows = new List<int>();
        string description;

        if (SplineShape.Sole(design, input) is { Spline: { } basis } term)
        {
            point[input] = c.From;
            var inside = SplineRange.Inside(context, c, point, "constraints.over");
            point[input] = c.To;
            if (!inside || !SplineRange.Inside(context, c, point, "constraints.over"))
            {
                return;
            }

            if (order > basis.Degree + 1)
            {
                context.Error(c.Pos, "constraints.kind", $"spline term '{term.Key}' has degree 0 (piecewise constant): it is {kind} only where it is constant; use degree 1 or more");
                return;
            }

            var local = SplineShape.Rows(basis, order, c.From, c.To);
            foreach (var row in local)
            {
                var raw = new double[design.P];
                for (var j = 0; j < row.Length; j++)
                {
                    raw[term.First + j] = sign * row[j];
                }

                rows.Add(context.Builder.AddRow($"c{index + 1}_s{rows.Count + 1}", 0, double.PositiveInfinity, context.Internal(raw), origin));
            }

            description = order <= basis.Degree
                ? $"through the spline coefficients (sufficient condition): the {local.Count} B-spline coefficients of the {what} of '{term.Key}' whose support meets [{c.From}, {c.To}] are {relation} 0"
                : $"through the spline coefficients (exact): the jumps of the piecewise constant {(order == 1 ? "curve" : "slope")} of '{term.Key}' at its {local.Count} knots within [{c.From}, {c.To}] are {relation} 0";
        }
        else
        {
            foreach (var t in design.Terms)
            {
                if (t.Spline is { } s && t.Inputs.Contains(input) && s.Degree < order)
                {
                    context.Error(c.Pos, "constraints.kind", $"spline term '{t.Key}' has degree {s.Degree}, so its {what} is not continuous; '{kind}' can be enforced on it only through its coefficients, which needs it to be the only term in '{input}' with '{input}' itself as its input");
                    return;
                }
            }

            for (var k = 0; k < grid; k++)
            {
                point[input] = GridPoint(c.From, c.To, grid, k);
                if (!SplineRange.Inside(context, c, point, "constraints.over"))
                {
                    return;
                }

                var jets = design.Basis.At(point, input);
                var row = jets.Select(j => sign * (order == 1 ? j.D1 : j.D2)).ToArray();
                rows.Add(context.Builder.AddRow($"c{index + 1}_g{k + 1}", 0, double.PositiveInfinity, context.Internal(row), origin));
            }

            description = $"{what} {relation} 0 at {grid} equally spaced points of [{c.From}, {c.To}] (both ends included)";
        }

        context.Constraints.Add(new LoweredConstraint(index, c, rows, [], description, check));
        context.Notes.Add(new LoweringNote($"constraint {index + 1}", c.Label, $"{rows.Count} rows: {description}"));
    }

    public static double GridPoint(double from, double to, int count, int k) =>
        k == count - 1 ? to : from + (to - from) * k / (count - 1);
}
