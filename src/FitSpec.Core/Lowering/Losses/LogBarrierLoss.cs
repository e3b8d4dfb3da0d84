using FitSpec.Spec;

namespace FitSpec.Lowering.Losses;

/// <summary>The log-barrier loss −a² log(1 − (e/a)²), solved by Newton steps, each a QP.</summary>
internal sealed record LogBarrierStrategy(double Limit) : ISolveStrategy
{
    public ProblemClass Class => ProblemClass.QPSequence;
}

/// <summary>Σ w φ(e) with φ(e) = −a² log(1 − (e/a)²) for |e| &lt; a: smooth and convex, but not a QP.</summary>
internal sealed class LogBarrierLoss : ILossUnit
{
    public LossKind Kind => LossKind.LogBarrier;

    public void Lower(LoweringContext context, LossSpec loss)
    {
        ArgumentNullException.ThrowIfNull(loss);
        var limit = loss.Parameter!.Value;
        SequentialLoss.Lower(
            context, loss, new LogBarrierStrategy(limit), $"log-barrier (limit {limit})",
            "sequence of QPs (Newton with line search): a minimax LP first finds a point strictly inside |e| < limit, "
            + "then each step minimises the loss's quadratic model under the constraints and a line search keeps every |e| < limit");
    }
}
