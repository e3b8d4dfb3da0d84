using FitSpec.Lowering;
using Highs.Native;
using MathNet.Numerics.LinearAlgebra;

namespace FitSpec.Solving;

/// <summary>
/// A primal active-set method for small strictly convex QPs (every variable has curvature), started from a
/// feasible point: each step solves the equality-constrained QP on the working set exactly (dense KKT system),
/// moves to the first blocking constraint, and drops a constraint whose multiplier has the wrong sign. Used when
/// HiGHS's QP solver stops short of a stationary point, which it has been seen to do at its starting point.
/// </summary>
internal static class DenseActiveSet
{
    public const int MaxVariables = 300;
    public const int MaxRows = 5000;

    public static bool Applies(FitProgram program) =>
        program.NumVars <= MaxVariables && program.NumRows <= MaxRows && !program.HasIntegers && program.HasQuadratic;

    private readonly record struct Side(int Index, bool IsRow, int Sense);

    /// <returns>An optimal point with multipliers in HiGHS's convention, or null (not strictly convex, no progress).</returns>
    public static HighsResult? Solve(FitProgram program, double[] start)
    {
        ArgumentNullException.ThrowIfNull(program);
        ArgumentNullException.ThrowIfNull(start);
        var n = program.NumVars;
        var m = program.NumRows;
        var q = DenseHessian(program);
        try
        {
            _ = q.Cholesky();
        }
        catch (ArgumentException)
        {
            // Not strictly convex (a variable without curvature): the working-set steps would not be unique.
            return null;
        }

        var a = new double[m][];
        for (var r = 0; r < m; r++)
        {
            a[r] = new double[n];
        }

        for (var j = 0; j < n; j++)
        {
            for (var k = program.ColStart[j]; k < program.ColStart[j + 1]; k++)
            {
                a[program.RowIndex[k]][j] += program.Values[k];
            }
        }

        var x = (double[])start.Clone();
        var working = new List<Side>();
        (double Lo, double Hi) Bounds(int index, bool isRow) => isRow ? (program.RowLower[index], program.RowUpper[index]) : (program.Lower[index], program.Upper[index]);
        bool AtBound(double v, double b) => double.IsFinite(b) && Math.Abs(v - b) <= 1e-9 * Math.Max(1, Math.Abs(b));

        // Working set: every equality, and every inequality side active at the start that is independent.
        foreach (var isRow in (bool[])[true, false])
        {
            for (var i = 0; i < (isRow ? m : n); i++)
            {
                var (lo, hi) = Bounds(i, isRow);
                var v = isRow ? Dot(a[i], x) : x[i];
                var sense = lo == hi ? 0 : AtBound(v, lo) ? 1 : AtBound(v, hi) ? -1 : 2;
                if (sense != 2)
                {
                    TryAdd(working, new Side(i, isRow, sense), a, n);
                }
            }
        }

        for (var iteration = 0; iteration < 20 * (n + m + 10); iteration++)
        {
            var g = program.HessianTimes(x);
            for (var j = 0; j < n; j++)
            {
                g[j] += program.Cost[j];
            }

            if (SolveKkt(q, working, a, g, n) is not var (d, lambda))
            {
                return null;
            }

            var step = Math.Sqrt(d.Sum(v => v * v));
            if (step <= 1e-13 * (1 + Math.Sqrt(x.Sum(v => v * v))))
            {
                // Stationary on the working set: optimal unless some inequality's multiplier has the wrong sign.
                var worst = -1;
                var worstValue = 1e-12 * (1 + g.Max(Math.Abs));
                for (var k = 0; k < working.Count; k++)
                {
                    var wrong = -working[k].Sense * lambda[k];
                    if (working[k].Sense != 0 && wrong > worstValue)
                    {
                        worst = k;
                        worstValue = wrong;
                    }
                }

                if (worst < 0)
                {
                    return Result(program, x, working, lambda, a);
                }

                working.RemoveAt(worst);
                continue;
            }

            var alpha = 1.0;
            Side? blocking = null;
            foreach (var isRow in (bool[])[true, false])
            {
                for (var i = 0; i < (isRow ? m : n); i++)
                {
                    if (working.Any(s => s.IsRow == isRow && s.Index == i))
                    {
                        continue;
                    }

                    var (lo, hi) = Bounds(i, isRow);
                    var v = isRow ? Dot(a[i], x) : x[i];
                    var dv = isRow ? Dot(a[i], d) : d[i];
                    if (dv < 0 && double.IsFinite(lo) && (lo - v) / dv < alpha)
                    {
                        alpha = Math.Max(0, (lo - v) / dv);
                        blocking = new Side(i, isRow, 1);
                    }
                    else if (dv > 0 && double.IsFinite(hi) && (hi - v) / dv < alpha)
                    {
                        alpha = Math.Max(0, (hi - v) / dv);
                        blocking = new Side(i, isRow, -1);
                    }
                }
            }

            for (var j = 0; j < n; j++)
            {
                x[j] += alpha * d[j];
            }

            if (blocking is { } b && !TryAdd(working, b, a, n))
            {
                return null;
            }

        }

        return null;
    }

    private static Matrix<double> DenseHessian(FitProgram program)
    {
        var n = program.NumVars;
        var q = Matrix<double>.Build.Dense(n, n);
        for (var j = 0; j < program.QStart.Length - 1; j++)
        {
            for (var k = program.QStart[j]; k < program.QStart[j + 1]; k++)
            {
                var i = program.QIndex[k];
                q[i, j] = program.QValue[k];
                q[j, i] = program.QValue[k];
            }
        }

        return q;
    }

    /// <summary>Adds a side unless its normal depends on the working set's (checked by a rank test).</summary>
    private static bool TryAdd(List<Side> working, Side side, double[][] a, int n)
    {
        var rows = working.Append(side).ToList();
        if (rows.Count > n)
        {
            return false;
        }

        var matrix = Matrix<double>.Build.Dense(rows.Count, n, (r, c) => Normal(rows[r], a, c));
        if (matrix.Rank() < rows.Count)
        {
            return false;
        }

        working.Add(side);
        return true;
    }

    private static double Normal(Side s, double[][] a, int column) => s.IsRow ? a[s.Index][column] : (s.Index == column ? 1 : 0);

    /// <summary>[Q A'; A 0][d; −λ] = [−g; 0]: the step to the working set's minimiser and its multipliers.</summary>
    private static (double[] D, double[] Lambda)? SolveKkt(Matrix<double> q, List<Side> working, double[][] a, double[] g, int n)
    {
        var w = working.Count;
        var k = Matrix<double>.Build.Dense(n + w, n + w);
        k.SetSubMatrix(0, 0, q);
        for (var r = 0; r < w; r++)
        {
            for (var c = 0; c < n; c++)
            {
                var v = Normal(working[r], a, c);
                k[n + r, c] = v;
                k[c, n + r] = v;
            }
        }

        var rhs = Vector<double>.Build.Dense(n + w);
        for (var j = 0; j < n; j++)
        {
            rhs[j] = -g[j];
        }

        var sol = k.LU().Solve(rhs);
        if (sol.Any(v => !double.IsFinite(v)))
        {
            return null;
        }

        return (sol.SubVector(0, n).ToArray(), sol.SubVector(n, w).Map(v => -v).ToArray());
    }

    private static HighsResult Result(FitProgram program, double[] x, List<Side> working, double[] lambda, double[][] a)
    {
        var rowDual = new double[program.NumRows];
        var colDual = new double[program.NumVars];
        for (var k = 0; k < working.Count; k++)
        {
            if (working[k].IsRow)
            {
                rowDual[working[k].Index] = lambda[k];
            }
            else
            {
                colDual[working[k].Index] = lambda[k];
            }
        }

        var rowValue = a.Select(r => Dot(r, x)).ToArray();
        return new HighsResult(0, HighsModelStatus.Optimal, program.Objective(x), x, colDual, rowValue, rowDual, 0, 0, 0, 0, 0, true, true);
    }

    private static double Dot(double[] u, double[] v)
    {
        double s = 0;
        for (var i = 0; i < u.Length; i++)
        {
            s += u[i] * v[i];
        }

        return s;
    }
}
