using FitSpec.Spec;

namespace FitSpec.Lowering.Constraints;

/// <summary>
/// min ≤ β_j ≤ max. Where β_j is a multiple of one internal θ_k (every plain term) it becomes a bound on θ_k,
/// so that a coefficient at its bound is exactly the bound; otherwise a row.
/// </summary>
internal sealed class BoundsUnit : IConstraintUnit
{
    public bool Handles(ConstraintSpec constraint) => constraint is BoundsConstraint;

    public void Lower(LoweringContext context, ConstraintSpec constraint, int index)
    {
        var c = (BoundsConstraint)constraint;
        var on = context.Resolve(c.On, c.Pos, "constraints.on", includeConstants: true);
        var lo = c.Min ?? double.NegativeInfinity;
        var hi = c.Max ?? double.PositiveInfinity;
        var rows = new List<int>();
        var vars = new List<(int, double)>();
        var b = context.Builder;
        foreach (var j in on)
        {
            var m = context.RawRow(j);
            if (m is [var single] && double.IsNegativeInfinity(b.GetLower(single.Index)) && double.IsPositiveInfinity(b.GetUpper(single.Index)))
            {
                var a = single.Value;
                var (l, u) = a > 0 ? (lo / a, hi / a) : (hi / a, lo / a);
                b.SetBounds(single.Index, l, u);
                vars.Add((single.Index, a));
            }
            else
            {
                var raw = new double[context.Design.P];
                raw[j] = 1;
                rows.Add(b.AddRow($"c{index + 1}_{context.Design.Coefficients[j].Name}", lo, hi, context.Internal(raw), new Origin(OriginKind.Constraint, index)));
            }
        }

        context.Constraints.Add(new LoweredConstraint(index, c, rows, vars, null, null));
        context.Notes.Add(new LoweringNote($"constraint {index + 1}", c.Label, $"{vars.Count} variable bounds, {rows.Count} rows"));
    }
}
