using FitSpec.Design;
using FitSpec.Spec;

namespace FitSpec.Lowering.Losses;

/// <summary>
/// Huber with width M (φ = e² inside, 2M|e| − M² outside) as a convex QP: e_i = u_i + s_i − t_i with u free,
/// s, t ≥ 0, objective Σ w (u_i² + 2M (s_i + t_i)). The quadratic part takes |e| up to M, the linear rest.
/// </summary>
internal sealed class HuberLoss : ILossUnit
{
    public LossKind Kind => LossKind.Huber;

    public void Lower(LoweringContext context, LossSpec loss)
    {
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(loss);
        var m = loss.Parameter!.Value;
        var design = context.Design;
        var b = context.Builder;
        var origin = new Origin(OriginKind.Loss, 0);
        for (var i = 0; i < design.Rows; i++)
        {
            var w = design.Weight(i);
            var u = b.AddVar($"q{i + 1}", double.NegativeInfinity, double.PositiveInfinity, 0, origin);
            var s = b.AddVar($"u{i + 1}", 0, double.PositiveInfinity, w * 2 * m, origin);
            var t = b.AddVar($"v{i + 1}", 0, double.PositiveInfinity, w * 2 * m, origin);
            b.AddHessian(u, u, 2 * w);
            context.AddResidualRow(i, [new Entry(u, 1), new Entry(s, 1), new Entry(t, -1)], origin);
        }

        context.Notes.Add(new LoweringNote("loss", $"huber (width {m})", $"QP: {design.Rows} residual rows, a quadratic part per row and two linear tails (r² inside ±{m}, slope 2·{m} outside)"));
    }
}
