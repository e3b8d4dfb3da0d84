using FitSpec.Spec;

namespace FitSpec.Lowering.Losses;

/// <summary>
/// No loss: only penalties count. With a residuals constraint this is basis pursuit (the sparsest-in-l1
/// coefficients that reproduce the measurements within the tolerance).
/// </summary>
internal sealed class NoLoss : ILossUnit
{
    public LossKind Kind => LossKind.None;

    public void Lower(LoweringContext context, LossSpec loss)
    {
        ArgumentNullException.ThrowIfNull(context);
        context.Notes.Add(new LoweringNote("loss", "none", "no loss terms: the objective is the penalties alone"));
    }
}
