using FitSpec.Design;
using FitSpec.Spec;

namespace FitSpec.Lowering.Penalties;

/// <summary>
/// λ Σ_i (Δ^k β)_i² over the listed coefficients in model order, where (Δ^k β)_i = Σ_r (-1)^(k-r) C(k,r) β_(i+r).
/// Each difference d_i is a row over β, written over θ through M. Squared norm: Hessian terms 2λ d_i d_i'
/// (and in the closed form the ridge row √λ d_i). Norm l1: one bound variable s_i ≥ |d_i| per difference,
/// two rows each, cost λ.
/// </summary>
internal sealed class SmoothnessPenalty : IPenaltyUnit
{
    public PenaltyKind Kind => PenaltyKind.Smoothness;

    public void Lower(LoweringContext context, PenaltySpec penalty, int index, IReadOnlyList<int> on)
    {
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(penalty);
        ArgumentNullException.ThrowIfNull(on);
        var order = penalty.Order ?? 2;
        var coefficients = context.Design.Coefficients;
        if (on.Count <= order)
        {
            // No difference of that order exists: the penalty would silently be zero.
            var names = on.Count == 0 ? "none" : string.Join(", ", on.Select(j => coefficients[j].Name));
            context.Error(penalty.Pos, "penalties.on", $"smoothness of order {order} needs at least {order + 1} coefficients in on: to take differences of, got {on.Count} ({names})");
            return;
        }

        var weights = DifferenceWeights(order);
        var lambda = penalty.Weight;
        var sqrt = Math.Sqrt(lambda);
        var origin = new Origin(OriginKind.Penalty, index);
        var b = context.Builder;
        var count = on.Count - order;
        for (var i = 0; i < count; i++)
        {
            var raw = new double[context.Design.P];
            for (var r = 0; r <= order; r++)
            {
                raw[on[i + r]] += weights[r];
            }

            var row = context.Internal(raw);
            var first = coefficients[on[i]].Name;
            if (penalty.NormL1)
            {
                AddAbsoluteValue(b, row, $"smooth{index + 1}_{first}", lambda, origin);
                continue;
            }

            context.RidgeRows.Add(row.Select(e => new Entry(e.Index, sqrt * e.Value)).ToArray());
            context.RidgeRaw.Add(Enumerable.Range(0, order + 1).Select(r => new Entry(on[i + r], sqrt * weights[r])).ToArray());
            foreach (var a in row)
            {
                foreach (var c in row)
                {
                    if (a.Index >= c.Index)
                    {
                        b.AddHessian(a.Index, c.Index, 2 * lambda * a.Value * c.Value);
                    }
                }
            }
        }

        var label = $"smoothness (order {order}, weight {lambda}{(penalty.NormL1 ? ", norm l1" : string.Empty)})";
        var how = penalty.NormL1
            ? $"LP terms: {count} differences of order {order}, one bound variable and 2 rows each"
            : context.BuildGramHessian
                ? $"QP terms: Hessian 2λ D'D from {count} differences of order {order}"
                : $"closed form: {count} difference rows √λ·D appended to the QR";
        context.Notes.Add(new LoweringNote($"penalty {index + 1}", label, $"{how} over {on.Count} coefficients in model order"));
    }

    /// <summary>(-1)^(k-r) C(k, r) for r = 0..k: the k-th forward difference.</summary>
    internal static double[] DifferenceWeights(int order)
    {
        var w = new double[order + 1];
        double binomial = 1;
        for (var r = 0; r <= order; r++)
        {
            w[r] = ((order - r) % 2 == 0 ? 1 : -1) * binomial;
            binomial = binomial * (order - r) / (r + 1);
        }

        return w;
    }

    private static void AddAbsoluteValue(ProgramBuilder b, Entry[] row, string name, double cost, Origin origin)
    {
        var s = b.AddVar($"abs_{name}", 0, double.PositiveInfinity, cost, origin);
        var plus = new Entry[row.Length + 1];
        var minus = new Entry[row.Length + 1];
        for (var k = 0; k < row.Length; k++)
        {
            plus[k] = new Entry(row[k].Index, -row[k].Value);
            minus[k] = row[k];
        }

        plus[row.Length] = new Entry(s, 1);
        minus[row.Length] = new Entry(s, 1);
        b.AddRow($"abs_{name}_pos", 0, double.PositiveInfinity, plus, origin);
        b.AddRow($"abs_{name}_neg", 0, double.PositiveInfinity, minus, origin);
    }
}
