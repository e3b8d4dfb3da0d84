using FitSpec.Design;
using FitSpec.Spec;

namespace FitSpec.Lowering.Penalties;

/// <summary>λ Σ |β_j|: one bound variable s_j ≥ |β_j| per coefficient (two rows each), cost λ.</summary>
internal sealed class L1Penalty : IPenaltyUnit
{
    public PenaltyKind Kind => PenaltyKind.L1;

    public void Lower(LoweringContext context, PenaltySpec penalty, int index, IReadOnlyList<int> on)
    {
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(penalty);
        ArgumentNullException.ThrowIfNull(on);
        var b = context.Builder;
        var origin = new Origin(OriginKind.Penalty, index);
        foreach (var j in on)
        {
            var name = context.Design.Coefficients[j].Name;
            var s = b.AddVar($"abs_{name}", 0, double.PositiveInfinity, penalty.Weight, origin);
            var m = context.RawRow(j);
            var plus = new Entry[m.Length + 1];
            var minus = new Entry[m.Length + 1];
            for (var k = 0; k < m.Length; k++)
            {
                plus[k] = new Entry(m[k].Index, -m[k].Value);
                minus[k] = m[k];
            }

            plus[m.Length] = new Entry(s, 1);
            minus[m.Length] = new Entry(s, 1);
            b.AddRow($"abs_{name}_pos", 0, double.PositiveInfinity, plus, origin);
            b.AddRow($"abs_{name}_neg", 0, double.PositiveInfinity, minus, origin);
        }

        context.Notes.Add(new LoweringNote($"penalty {index + 1}", $"l1 (weight {penalty.Weight})", $"LP terms: {on.Count} bound variables, {2 * on.Count} rows"));
    }
}
