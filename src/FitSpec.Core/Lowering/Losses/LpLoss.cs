using FitSpec.Spec;

namespace FitSpec.Lowering.Losses;

/// <summary>The power loss |e|^p, solved by Newton steps, each a QP.</summary>
internal sealed record LpStrategy(double P) : ISolveStrategy
{
    public ProblemClass Class => ProblemClass.QPSequence;
}

/// <summary>Σ w |e|^p for p &gt; 1: smooth (C¹) and convex, but not a QP unless p = 2.</summary>
internal sealed class LpLoss : ILossUnit
{
    public LossKind Kind => LossKind.Lp;

    public void Lower(LoweringContext context, LossSpec loss)
    {
        ArgumentNullException.ThrowIfNull(loss);
        var p = loss.Parameter!.Value;
        SequentialLoss.Lower(
            context, loss, new LpStrategy(p), $"lp (p = {p})",
            "sequence of QPs (Newton with line search) from the least-squares fit; the curvature p(p-1)|e|^(p-2) is "
            + "evaluated with |e| floored at 1e-6 of the rms residual, the line search uses the true objective");
    }
}
