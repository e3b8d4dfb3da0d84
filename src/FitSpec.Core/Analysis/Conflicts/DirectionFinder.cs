using FitSpec.Lowering;
using FitSpec.Results;
using FitSpec.Solving;
using Highs.Native;

namespace FitSpec.Analysis.Conflicts;

/// <summary>
/// For an unbounded fit: a direction d in which every point of the feasible set can move for ever (A d stays
/// within each row's finite sides, d within each variable's finite bounds), along which the objective has no
/// curvature (Q d = 0) and falls (c'd &lt; 0). Found as the LP  min c'd  over those d with |d_j| ≤ 1; a
/// negative optimum is such a direction, a zero one proves there is none.
/// </summary>
public static class DirectionFinder
{
    /// <summary>The direction over the program's variables (largest component 1), or null when none exists.</summary>
    public static double[]? Find(FitProgram program, double seconds = 10)
    {
        ArgumentNullException.ThrowIfNull(program);
        var n = program.NumVars;
        var lower = new double[n];
        var upper = new double[n];
        for (var j = 0; j < n; j++)
        {
            lower[j] = double.IsFinite(program.Lower[j]) ? 0 : -1;
            upper[j] = double.IsFinite(program.Upper[j]) ? 0 : 1;
        }

        var rowLower = program.RowLower.Select(v => double.IsFinite(v) ? 0.0 : double.NegativeInfinity).ToList();
        var rowUpper = program.RowUpper.Select(v => double.IsFinite(v) ? 0.0 : double.PositiveInfinity).ToList();
        var columns = Enumerable.Range(0, n).Select(j => Column(program, j)).ToList();
        AddCurvatureRows(program, columns, rowLower, rowUpper);

        var start = new int[n + 1];
        var index = new List<int>();
        var values = new List<double>();
        for (var j = 0; j < n; j++)
        {
            foreach (var (r, v) in columns[j])
            {
                index.Add(r);
                values.Add(v);
            }

            start[j + 1] = index.Count;
        }

        using var highs = FeasibilityProgram.Open(new HighsModel(n, rowLower.Count, 0, program.Cost, lower, upper, [.. rowLower], [.. rowUpper], start, [.. index], [.. values], null, null, null, null), seconds);
        var run = highs.Run();
        if (run.ModelStatus != HighsModelStatus.Optimal || !(run.ObjectiveValue < -1e-9))
        {
            return null;
        }

        var d = run.ColValue;
        var largest = d.Max(Math.Abs);
        return largest > 0 ? d.Select(v => v / largest).ToArray() : null;
    }

    /// <summary>The direction on the user's coefficients (raw basis), scaled so its largest component is ±1.</summary>
    public static FreeDirection? Describe(Design.Design design, double[] direction)
    {
        ArgumentNullException.ThrowIfNull(design);
        ArgumentNullException.ThrowIfNull(direction);
        var beta = design.ToRaw(direction.AsSpan(0, design.P));
        var largest = beta.Max(Math.Abs);
        if (!(largest > 0))
        {
            return null;
        }

        var components = design.Coefficients
            .Select((c, j) => new CoefficientValue(c.Name, Math.Round(beta[j] / largest, 12), c.TermKey))
            .Where(c => c.Value != 0)
            .ToList();
        return new FreeDirection(components);
    }

    private static List<(int Row, double Value)> Column(FitProgram p, int j)
    {
        var list = new List<(int, double)>();
        for (var k = p.ColStart[j]; k < p.ColStart[j + 1]; k++)
        {
            list.Add((p.RowIndex[k], p.Values[k]));
        }

        return list;
    }

    // Q d = 0 for the full symmetric Q (stored as its lower triangle): one row per variable that Q touches.
    private static void AddCurvatureRows(FitProgram p, List<List<(int Row, double Value)>> columns, List<double> rowLower, List<double> rowUpper)
    {
        if (!p.HasQuadratic)
        {
            return;
        }

        var rowOf = new Dictionary<int, int>();
        int RowFor(int i)
        {
            if (!rowOf.TryGetValue(i, out var r))
            {
                r = rowLower.Count;
                rowOf[i] = r;
                rowLower.Add(0);
                rowUpper.Add(0);
            }

            return r;
        }

        for (var j = 0; j < p.QStart.Length - 1; j++)
        {
            for (var k = p.QStart[j]; k < p.QStart[j + 1]; k++)
            {
                var i = p.QIndex[k];
                var q = p.QValue[k];
                columns[j].Add((RowFor(i), q)); // (Q d)_i gets Q_ij d_j
                if (i != j)
                {
                    columns[i].Add((RowFor(j), q)); // and (Q d)_j gets Q_ji d_i
                }
            }
        }
    }
}
