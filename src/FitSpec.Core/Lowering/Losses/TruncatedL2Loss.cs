using FitSpec.Spec;

namespace FitSpec.Lowering.Losses;

/// <summary>The capped square min(e², c²), non-convex: a local method, its answer flagged as local.</summary>
internal sealed record TruncatedL2Strategy(double Cap) : ISolveStrategy
{
    public ProblemClass Class => ProblemClass.Local;
}

/// <summary>Σ w min(e², c²): least squares that stops counting an observation once |e| passes the cap.</summary>
internal sealed class TruncatedL2Loss : ILossUnit
{
    public LossKind Kind => LossKind.TruncatedL2;

    public void Lower(LoweringContext context, LossSpec loss)
    {
        ArgumentNullException.ThrowIfNull(loss);
        var cap = loss.Parameter!.Value;
        SequentialLoss.Lower(
            context, loss, new TruncatedL2Strategy(cap), $"truncated-l2 (cap {cap})",
            "local method: alternating inlier/outlier least squares from 3 starts (the l2, l1 and minimax fits under "
            + "the same constraints and penalties); non-convex, so the result is a local optimum");
    }
}
