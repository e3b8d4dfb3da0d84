using FitSpec.Spec;

namespace FitSpec.Lowering.Constraints;

/// <summary>f(at) == v (or within min/max): one row, the basis evaluated at the point.</summary>
internal sealed class ValueUnit : IConstraintUnit
{
    public bool Handles(ConstraintSpec constraint) => constraint is ValueConstraint;

    public void Lower(LoweringContext context, ConstraintSpec constraint, int index)
    {
        var c = (ValueConstraint)constraint;
        if (PointInputs.Complete(context, c, c.At, null, 0) is not { } point || !SplineRange.Inside(context, c, point, "constraints.at"))
        {
            return;
        }

        var phi = context.Design.Basis.At(point, null).Select(j => j.Value).ToArray();
        var (lo, hi) = c.EqualTo is { } v ? (v, v) : (c.Min ?? double.NegativeInfinity, c.Max ?? double.PositiveInfinity);
        var row = context.Builder.AddRow($"c{index + 1}", lo, hi, context.Internal(phi), new Origin(OriginKind.Constraint, index));
        context.Constraints.Add(new LoweredConstraint(index, c, [row], [], null, null) { IsEquality = c.EqualTo is not null });
        context.Notes.Add(new LoweringNote($"constraint {index + 1}", c.Label, "1 row: the basis evaluated at the point"));
    }
}
