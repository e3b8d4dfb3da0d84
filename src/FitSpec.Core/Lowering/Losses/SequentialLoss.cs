using FitSpec.Spec;

namespace FitSpec.Lowering.Losses;

/// <summary>
/// What the losses solved outside one program share at lowering: the program keeps only the constraints and
/// penalties (added by their own units), and the strategy tells the solve stage how to treat the loss.
/// </summary>
internal static class SequentialLoss
{
    public static void Lower(LoweringContext context, LossSpec loss, ISolveStrategy strategy, string label, string how)
    {
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(loss);
        // A count penalty needs its own strategy (a mixed-integer search); the two do not compose yet.
        if (context.Spec.Penalties.FirstOrDefault(p => p.Kind == PenaltyKind.Count) is { } count)
        {
            context.Error(count.Pos, "penalties.kind", $"a count penalty cannot be combined with loss '{loss.KindName}' yet: that loss is solved as a sequence of programs, and a count penalty needs a mixed-integer search of its own");
            return;
        }

        context.Strategy = strategy;
        context.Notes.Add(new LoweringNote("loss", label, how));
    }
}
