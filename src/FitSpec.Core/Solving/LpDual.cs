using FitSpec.Lowering;
using Highs.Native;

namespace FitSpec.Solving;

/// <summary>
/// The LP dual of a program, built so that a primal column appearing in a single row with one finite bound
/// (the residual split variables of l1/quantile fits) becomes a bound on that row's dual instead of a dual
/// row. An l1 fit with n observations and p coefficients so becomes p rows and n bounded columns.
///
/// Primal: min c'x + c0, rl ≤ Ax ≤ ru, l ≤ x ≤ u. Dual: max Σ rl·y⁺ + ru·y⁻ + Σ l·z⁺ + u·z⁻ + c0 subject to
/// A_j'y + z_j = c_j for every kept column j, with y⁺, z⁺ ≥ 0 and y⁻, z⁻ ≤ 0 (present where the bound is finite).
/// </summary>
internal sealed class LpDual
{
    private readonly FitProgram _p;
    private readonly bool[] _eliminated;
    private readonly int[] _dualRowOfColumn;
    private readonly List<(int Row, int Column)> _rowColumns = [];
    private readonly List<(int Var, int Column)> _boundColumns = [];

    private LpDual(FitProgram p, bool[] eliminated, int[] dualRowOfColumn, HighsModel model, List<(int, int)> rowColumns, List<(int, int)> boundColumns)
    {
        _p = p;
        _eliminated = eliminated;
        _dualRowOfColumn = dualRowOfColumn;
        Model = model;
        _rowColumns = rowColumns;
        _boundColumns = boundColumns;
    }

    public HighsModel Model { get; }

    /// <summary>Rows the dual would have (one per primal column that is not eliminated).</summary>
    public static int RowCount(FitProgram p)
    {
        var eliminated = Eliminated(p, ColumnCounts(p));
        return eliminated.Count(e => !e);
    }

    private static int[] ColumnCounts(FitProgram p)
    {
        var counts = new int[p.NumVars];
        for (var j = 0; j < p.NumVars; j++)
        {
            counts[j] = p.ColStart[j + 1] - p.ColStart[j];
        }

        return counts;
    }

    private static bool SingleDualColumn(FitProgram p, int r) =>
        p.RowLower[r] == p.RowUpper[r] || double.IsFinite(p.RowLower[r]) != double.IsFinite(p.RowUpper[r]);

    private static bool[] Eliminated(FitProgram p, int[] counts)
    {
        var eliminated = new bool[p.NumVars];
        for (var j = 0; j < p.NumVars; j++)
        {
            if (counts[j] != 1 || (double.IsFinite(p.Lower[j]) && double.IsFinite(p.Upper[j])))
            {
                continue;
            }

            eliminated[j] = SingleDualColumn(p, p.RowIndex[p.ColStart[j]]);
        }

        return eliminated;
    }

    public static LpDual Build(FitProgram p)
    {
        var eliminated = Eliminated(p, ColumnCounts(p));
        var dualRowOfColumn = new int[p.NumVars];
        var dualRows = 0;
        for (var j = 0; j < p.NumVars; j++)
        {
            dualRowOfColumn[j] = eliminated[j] ? -1 : dualRows++;
        }

        // Row-wise view of A, to emit each dual column (one per primal row) in one pass.
        var rowStart = new int[p.NumRows + 1];
        foreach (var r in p.RowIndex)
        {
            rowStart[r + 1]++;
        }

        for (var r = 0; r < p.NumRows; r++)
        {
            rowStart[r + 1] += rowStart[r];
        }

        var fill = (int[])rowStart.Clone();
        var rowCol = new int[p.NonZeros];
        var rowVal = new double[p.NonZeros];
        for (var j = 0; j < p.NumVars; j++)
        {
            for (var k = p.ColStart[j]; k < p.ColStart[j + 1]; k++)
            {
                var pos = fill[p.RowIndex[k]]++;
                rowCol[pos] = j;
                rowVal[pos] = p.Values[k];
            }
        }

        var cost = new List<double>();
        var lower = new List<double>();
        var upper = new List<double>();
        var start = new List<int> { 0 };
        var index = new List<int>();
        var value = new List<double>();
        var rowColumns = new List<(int, int)>();
        var boundColumns = new List<(int, int)>();
        var constant = p.Offset;

        void AddColumn(double c, double lo, double hi, IEnumerable<(int Row, double Value)> entries)
        {
            cost.Add(c);
            lower.Add(lo);
            upper.Add(hi);
            foreach (var (row, v) in entries)
            {
                index.Add(row);
                value.Add(v);
            }

            start.Add(index.Count);
        }

        IEnumerable<(int, double)> KeptEntries(int r)
        {
            for (var k = rowStart[r]; k < rowStart[r + 1]; k++)
            {
                var j = rowCol[k];
                if (!eliminated[j])
                {
                    yield return (dualRowOfColumn[j], rowVal[k]);
                }
            }
        }

        for (var r = 0; r < p.NumRows; r++)
        {
            var lo = p.RowLower[r];
            var hi = p.RowUpper[r];
            if (SingleDualColumn(p, r))
            {
                // One column y_r: free for an equality, ≥ 0 for a lower bound, ≤ 0 for an upper bound.
                var c = double.IsFinite(lo) ? lo : hi;
                var yl = lo == hi ? double.NegativeInfinity : double.IsFinite(lo) ? 0 : double.NegativeInfinity;
                var yu = lo == hi ? double.PositiveInfinity : double.IsFinite(lo) ? double.PositiveInfinity : 0;
                for (var k = rowStart[r]; k < rowStart[r + 1]; k++)
                {
                    var j = rowCol[k];
                    if (!eliminated[j])
                    {
                        continue;
                    }

                    // a·y_r + z_j = c_j with z_j ≥ 0 (lower-bounded x_j), ≤ 0 (upper-bounded) or 0 (free).
                    var a = rowVal[k];
                    var cj = p.Cost[j];
                    if (double.IsFinite(p.Lower[j]))
                    {
                        constant += p.Lower[j] * cj;
                        c -= p.Lower[j] * a;
                        if (a > 0)
                        {
                            yu = Math.Min(yu, cj / a);
                        }
                        else
                        {
                            yl = Math.Max(yl, cj / a);
                        }
                    }
                    else if (double.IsFinite(p.Upper[j]))
                    {
                        constant += p.Upper[j] * cj;
                        c -= p.Upper[j] * a;
                        if (a > 0)
                        {
                            yl = Math.Max(yl, cj / a);
                        }
                        else
                        {
                            yu = Math.Min(yu, cj / a);
                        }
                    }
                    else
                    {
                        yl = Math.Max(yl, cj / a);
                        yu = Math.Min(yu, cj / a);
                    }
                }

                rowColumns.Add((r, cost.Count));
                AddColumn(c, yl, yu, KeptEntries(r));
            }
            else if (double.IsFinite(lo))
            {
                rowColumns.Add((r, cost.Count));
                AddColumn(lo, 0, double.PositiveInfinity, KeptEntries(r));
                rowColumns.Add((r, cost.Count));
                AddColumn(hi, double.NegativeInfinity, 0, KeptEntries(r));
            }
        }

        var rhs = new double[dualRows];
        for (var j = 0; j < p.NumVars; j++)
        {
            if (eliminated[j])
            {
                continue;
            }

            var d = dualRowOfColumn[j];
            rhs[d] = p.Cost[j];
            if (double.IsFinite(p.Lower[j]))
            {
                boundColumns.Add((j, cost.Count));
                AddColumn(p.Lower[j], 0, double.PositiveInfinity, [(d, 1.0)]);
            }

            if (double.IsFinite(p.Upper[j]))
            {
                boundColumns.Add((j, cost.Count));
                AddColumn(p.Upper[j], double.NegativeInfinity, 0, [(d, 1.0)]);
            }
        }

        // HiGHS minimises: solve min -D.
        var model = new HighsModel(
            cost.Count, dualRows, -constant,
            cost.Select(c => -c).ToArray(), [.. lower], [.. upper], rhs, (double[])rhs.Clone(),
            [.. start], [.. index], [.. value]);
        return new LpDual(p, eliminated, dualRowOfColumn, model, rowColumns, boundColumns);
    }

    /// <summary>The primal point and its duals, from the dual's solution.</summary>
    public (double[] X, double[] RowDual, double[] ColDual) Recover(HighsResult run)
    {
        var p = _p;
        var x = new double[p.NumVars];
        var rowDual = new double[p.NumRows];
        var colDual = new double[p.NumVars];
        for (var j = 0; j < p.NumVars; j++)
        {
            if (!_eliminated[j])
            {
                x[j] = -run.RowDual[_dualRowOfColumn[j]];
            }
        }

        foreach (var (r, col) in _rowColumns)
        {
            rowDual[r] += run.ColValue[col];
        }

        foreach (var (j, col) in _boundColumns)
        {
            colDual[j] += run.ColValue[col];
        }

        var activity = p.RowActivity(x);
        var byRow = new Dictionary<int, List<int>>();
        for (var j = 0; j < p.NumVars; j++)
        {
            if (!_eliminated[j])
            {
                continue;
            }

            var r = p.RowIndex[p.ColStart[j]];
            if (!byRow.TryGetValue(r, out var list))
            {
                byRow[r] = list = [];
            }

            list.Add(j);
            colDual[j] = p.Cost[j] - p.Values[p.ColStart[j]] * rowDual[r];
        }

        foreach (var (r, singles) in byRow)
        {
            SettleSingletons(p, r, singles, activity[r], x);
        }

        return (x, rowDual, colDual);
    }

    // Each eliminated column starts at its finite bound; the row's remaining gap goes to the cheapest
    // column that can move in the needed direction (exact for the split residual variables).
    private static void SettleSingletons(FitProgram p, int r, List<int> singles, double activity, double[] x)
    {
        var sum = activity;
        foreach (var j in singles)
        {
            x[j] = double.IsFinite(p.Lower[j]) ? p.Lower[j] : double.IsFinite(p.Upper[j]) ? p.Upper[j] : 0;
            sum += p.Values[p.ColStart[j]] * x[j];
        }

        var delta = sum < p.RowLower[r] ? p.RowLower[r] - sum : sum > p.RowUpper[r] ? p.RowUpper[r] - sum : 0;
        if (delta == 0)
        {
            return;
        }

        var best = -1;
        var bestCost = double.PositiveInfinity;
        foreach (var j in singles)
        {
            var a = p.Values[p.ColStart[j]];
            var direction = Math.Sign(delta) * Math.Sign(a);
            var canMove = direction > 0 ? double.IsPositiveInfinity(p.Upper[j]) : double.IsNegativeInfinity(p.Lower[j]);
            var unitCost = p.Cost[j] * direction / Math.Abs(a);
            if (canMove && unitCost < bestCost)
            {
                bestCost = unitCost;
                best = j;
            }
        }

        if (best >= 0)
        {
            x[best] += delta / p.Values[p.ColStart[best]];
        }
    }
}
