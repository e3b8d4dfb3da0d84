using FitSpec.Design;
using FitSpec.Spec;

namespace FitSpec.Lowering.Losses;

/// <summary>max_i w_i |e_i|: minimise t with -t ≤ w_i (y_i - x_i'θ) ≤ t (two rows per observation).</summary>
internal sealed class LinfLoss : ILossUnit
{
    public LossKind Kind => LossKind.Linf;

    public void Lower(LoweringContext context, LossSpec loss)
    {
        var design = context.Design;
        var b = context.Builder;
        var origin = new Origin(OriginKind.Loss, 0);
        var t = b.AddVar("t", 0, double.PositiveInfinity, 1, origin);
        var p = design.P;
        var entries = new Entry[p + 1];
        for (var i = 0; i < design.Rows; i++)
        {
            var w = design.Weight(i);
            for (var j = 0; j < p; j++)
            {
                entries[j] = new Entry(j, w * design.X[j][i]);
            }

            entries[p] = new Entry(t, 1);
            b.AddRow($"lo{i + 1}", w * design.Y[i], double.PositiveInfinity, entries, origin);
            entries[p] = new Entry(t, -1);
            b.AddRow($"hi{i + 1}", double.NegativeInfinity, w * design.Y[i], entries, origin);
        }

        context.PreferredForm = LpForm.Primal;
        context.Notes.Add(new LoweringNote("loss", "linf", $"LP: bound variable t, {2 * design.Rows} rows (solved as is: faster than its dual by measurement)"));
    }
}
