using FitSpec.Design;
using FitSpec.Spec;

namespace FitSpec.Lowering.Losses;

/// <summary>
/// Dead zone of width a (φ = max(0, |e| − a)) as an LP: e_i = d_i + u_i − v_i with |d_i| ≤ a free of cost and
/// u, v ≥ 0 costing w each.
/// </summary>
internal sealed class DeadzoneLoss : ILossUnit
{
    public LossKind Kind => LossKind.Deadzone;

    public void Lower(LoweringContext context, LossSpec loss)
    {
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(loss);
        var a = loss.Parameter!.Value;
        var design = context.Design;
        var b = context.Builder;
        var origin = new Origin(OriginKind.Loss, 0);
        for (var i = 0; i < design.Rows; i++)
        {
            var w = design.Weight(i);
            var d = b.AddVar($"d{i + 1}", -a, a, 0, origin);
            var u = b.AddVar($"u{i + 1}", 0, double.PositiveInfinity, w, origin);
            var v = b.AddVar($"v{i + 1}", 0, double.PositiveInfinity, w, origin);
            context.AddResidualRow(i, [new Entry(d, 1), new Entry(u, 1), new Entry(v, -1)], origin);
        }

        context.Notes.Add(new LoweringNote("loss", $"deadzone (width {a})", $"LP: {design.Rows} residual rows; a free band variable |d| ≤ {a} and two costed tails per row"));
    }
}
