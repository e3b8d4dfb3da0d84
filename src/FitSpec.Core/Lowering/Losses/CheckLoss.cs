using FitSpec.Design;

namespace FitSpec.Lowering.Losses;

/// <summary>
/// The piecewise-linear loss a·e⁺ + b·e⁻ per observation, lowered as x_i'θ + u_i - v_i = y_i with u, v ≥ 0
/// (one row per observation). The solve stage may solve this through its smaller dual (p rows).
/// </summary>
internal static class CheckLoss
{
    public static void Lower(LoweringContext context, double above, double below, string label)
    {
        var design = context.Design;
        var b = context.Builder;
        var origin = new Origin(OriginKind.Loss, 0);
        b.Reserve(2 * design.Rows, design.Rows, design.Rows * (design.P + 2));
        for (var i = 0; i < design.Rows; i++)
        {
            var w = design.Weight(i);
            var u = b.AddVar($"u{i + 1}", 0, double.PositiveInfinity, w * above, origin);
            var v = b.AddVar($"v{i + 1}", 0, double.PositiveInfinity, w * below, origin);
            context.AddResidualRow(i, [new Entry(u, 1), new Entry(v, -1)], origin);
        }

        context.PreferredForm = Spec.LpForm.Dual;
        context.Notes.Add(new LoweringNote("loss", label, $"LP: {design.Rows} residual rows, {2 * design.Rows} split variables; solved through its dual ({design.P} rows)"));
    }
}

/// <summary>Σ w |e|.</summary>
internal sealed class L1Loss : ILossUnit
{
    public Spec.LossKind Kind => Spec.LossKind.L1;

    public void Lower(LoweringContext context, Spec.LossSpec loss) => CheckLoss.Lower(context, 1, 1, "l1");
}

/// <summary>Σ w ρ_τ(e): τe for e ≥ 0, (τ-1)e below.</summary>
internal sealed class QuantileLoss : ILossUnit
{
    public Spec.LossKind Kind => Spec.LossKind.Quantile;

    public void Lower(LoweringContext context, Spec.LossSpec loss)
    {
        ArgumentNullException.ThrowIfNull(loss);
        var tau = loss.Parameter!.Value;
        CheckLoss.Lower(context, tau, 1 - tau, $"quantile (tau = {tau})");
    }
}
