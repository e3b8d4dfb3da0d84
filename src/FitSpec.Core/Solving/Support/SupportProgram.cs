using FitSpec.Design;
using FitSpec.Lowering;
using FitSpec.Lowering.Penalties;

namespace FitSpec.Solving.Support;

/// <summary>
/// The lowered count program restricted to one support: no integers, each indicator fixed (1 in the support,
/// 0 outside), the big-M rows and Σ z ≤ K made free (so they carry no price that belongs to the user's own
/// bounds), and every coefficient outside the support fixed at 0. The lowered program's variables and rows
/// keep their indices; rows are only appended.
/// </summary>
internal static class SupportProgram
{
    public static FitProgram Restrict(LoweredFit fit, CountStrategy strategy, IReadOnlySet<int> support)
    {
        var p = fit.Program;
        var lower = (double[])p.Lower.Clone();
        var upper = (double[])p.Upper.Clone();
        var rowLower = (double[])p.RowLower.Clone();
        var rowUpper = (double[])p.RowUpper.Clone();
        var extra = new List<(string Name, Entry[] Row)>();
        foreach (var c in strategy.Counted)
        {
            var chosen = support.Contains(c.Coefficient);
            lower[c.Binary] = upper[c.Binary] = chosen ? 1 : 0;
            Free(rowLower, rowUpper, c.UpperRow);
            Free(rowLower, rowUpper, c.LowerRow);
            if (chosen)
            {
                continue;
            }

            // A bound on a free θ_k makes β_j = a θ_k exactly 0. Where θ_k already carries a user's bound (or β_j
            // mixes several θ), an equality row does it instead, so that the price of the exclusion is not
            // reported as the price of the user's bound.
            var m = fit.Design.RawFromInternal[c.Coefficient];
            if (m is [var single] && double.IsNegativeInfinity(p.Lower[single.Index]) && double.IsPositiveInfinity(p.Upper[single.Index]))
            {
                lower[single.Index] = upper[single.Index] = 0;
            }
            else
            {
                extra.Add(($"support_{c.Name}_zero", m));
            }
        }

        Free(rowLower, rowUpper, strategy.CardinalityRow);
        var origin = new Origin(OriginKind.Penalty, strategy.PenaltyIndex);
        var (colStart, rowIndex, values) = AppendRows(p, extra.Select(e => e.Row).ToList());
        return p with
        {
            Lower = lower,
            Upper = upper,
            Integer = new bool[p.NumVars],
            RowNames = [.. p.RowNames, .. extra.Select(e => e.Name)],
            RowLower = [.. rowLower, .. extra.Select(_ => 0.0)],
            RowUpper = [.. rowUpper, .. extra.Select(_ => 0.0)],
            RowOrigin = [.. p.RowOrigin, .. extra.Select(_ => origin)],
            ColStart = colStart,
            RowIndex = rowIndex,
            Values = values,
        };
    }

    /// <summary>The user's coefficients β = M θ, with those outside the support set to exactly 0.</summary>
    public static double[] Raw(Design.Design design, ReadOnlySpan<double> x, IReadOnlySet<int> support, CountStrategy strategy)
    {
        var beta = design.ToRaw(x[..design.P]);
        foreach (var c in strategy.Counted)
        {
            if (!support.Contains(c.Coefficient))
            {
                beta[c.Coefficient] = 0;
            }
        }

        return beta;
    }

    private static void Free(double[] rowLower, double[] rowUpper, int row)
    {
        rowLower[row] = double.NegativeInfinity;
        rowUpper[row] = double.PositiveInfinity;
    }

    // New rows get indices NumRows, NumRows+1, …, so appending them at the end of each column keeps every
    // column's row indices increasing.
    private static (int[] Start, int[] Index, double[] Value) AppendRows(FitProgram p, IReadOnlyList<Entry[]> rows)
    {
        if (rows.Count == 0)
        {
            return (p.ColStart, p.RowIndex, p.Values);
        }

        var added = new List<(int Row, double Value)>[p.NumVars];
        for (var r = 0; r < rows.Count; r++)
        {
            foreach (var e in rows[r])
            {
                (added[e.Index] ??= []).Add((p.NumRows + r, e.Value));
            }
        }

        var start = new int[p.NumVars + 1];
        var index = new List<int>(p.NonZeros + rows.Sum(r => r.Length));
        var value = new List<double>(index.Capacity);
        for (var j = 0; j < p.NumVars; j++)
        {
            for (var k = p.ColStart[j]; k < p.ColStart[j + 1]; k++)
            {
                index.Add(p.RowIndex[k]);
                value.Add(p.Values[k]);
            }

            foreach (var (row, v) in added[j] ?? [])
            {
                index.Add(row);
                value.Add(v);
            }

            start[j + 1] = index.Count;
        }

        return (start, [.. index], [.. value]);
    }
}
