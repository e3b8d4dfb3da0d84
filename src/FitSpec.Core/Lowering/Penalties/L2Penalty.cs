using FitSpec.Design;
using FitSpec.Spec;

namespace FitSpec.Lowering.Penalties;

/// <summary>λ Σ β_j²: Hessian terms 2λ m_j m_j' (m_j = row j of M); in the closed form, ridge rows √λ m_j.</summary>
internal sealed class L2Penalty : IPenaltyUnit
{
    public PenaltyKind Kind => PenaltyKind.L2;

    public void Lower(LoweringContext context, PenaltySpec penalty, int index, IReadOnlyList<int> on)
    {
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(penalty);
        ArgumentNullException.ThrowIfNull(on);
        var lambda = penalty.Weight;
        foreach (var j in on)
        {
            var m = context.RawRow(j);
            var sqrt = Math.Sqrt(lambda);
            context.RidgeRows.Add(m.Select(e => new Entry(e.Index, sqrt * e.Value)).ToArray());
            context.RidgeRaw.Add([new Entry(j, sqrt)]);
            foreach (var a in m)
            {
                foreach (var c in m)
                {
                    if (a.Index >= c.Index)
                    {
                        context.Builder.AddHessian(a.Index, c.Index, 2 * lambda * a.Value * c.Value);
                    }
                }
            }
        }

        var how = context.BuildGramHessian ? "QP terms: diagonal Hessian" : "closed form: ridge rows appended to the QR";
        context.Notes.Add(new LoweringNote($"penalty {index + 1}", $"l2 (weight {lambda})", $"{how} on {on.Count} coefficients"));
    }
}
