using System.Diagnostics;
using FitSpec.Diagnostics;
using FitSpec.Lowering;

namespace FitSpec.Solving;

/// <summary>
/// Unconstrained (ridge-)least squares by Householder QR with column scaling and one step of iterative
/// refinement, never forming X'X. Used for an l2 loss with no constraints.
/// </summary>
internal sealed class QrLeastSquares : IFitSolver
{
    /// <summary>|R_kk| below this fraction of the largest |R_jj| counts as rank deficiency.</summary>
    public const double RankTolerance = 1e-13;

    /// <summary>Problems with rows × coefficients² up to this are also solved in double-double (milliseconds).</summary>
    public const long ExtendedPrecisionLimit = 20_000_000;

    public int Priority => 0;

    public bool CanSolve(LoweredFit fit, SolveOptions options) => fit.ClosedForm is not null;

    public Solution Solve(LoweredFit fit, SolveOptions options, CancellationToken cancellation)
    {
        var clock = Stopwatch.StartNew();
        var design = fit.Design;
        var n = design.Rows;
        var ridge = fit.ClosedForm!.RidgeRows;
        var m = n + ridge.Count;
        var p = design.P;
        if (m < p)
        {
            throw new FitSpecException(FitSpec.Design.RankCheck.TooFewRows(fit.Spec, n, p));
        }

        var sqrtW = new double[n];
        for (var i = 0; i < n; i++)
        {
            sqrtW[i] = Math.Sqrt(design.Weight(i));
        }

        var a = new double[p][];
        var scale = new double[p];
        for (var j = 0; j < p; j++)
        {
            var col = new double[m];
            var x = design.X[j];
            for (var i = 0; i < n; i++)
            {
                col[i] = sqrtW[i] * x[i];
            }

            for (var r = 0; r < ridge.Count; r++)
            {
                foreach (var e in ridge[r])
                {
                    if (e.Index == j)
                    {
                        col[n + r] += e.Value;
                    }
                }
            }

            var norm = Norm(col, 0);
            scale[j] = norm > 0 ? 1 / norm : 1;
            for (var i = 0; i < m; i++)
            {
                col[i] *= scale[j];
            }

            a[j] = col;
        }

        var b = new double[m];
        for (var i = 0; i < n; i++)
        {
            b[i] = sqrtW[i] * design.Y[i];
        }

        var qr = Householder.Factor(a);
        var deficient = qr.DeficientColumn(RankTolerance);
        if (deficient >= 0)
        {
            var name = design.Coefficients[deficient].Name;
            var earlier = string.Join(", ", design.Coefficients.Take(deficient).Select(c => c.Name));
            throw new FitSpecException(new Diagnostic(fit.Spec.File, fit.Spec.Model.Pos.Line, fit.Spec.Model.Pos.Column, "model.terms",
                $"the design is rank deficient: coefficient '{name}' is (numerically) a combination of {(earlier.Length == 0 ? "nothing (its column is zero)" : earlier)}; remove a term or add an l2 penalty"));
        }

        var z = qr.Solve(b);
        var theta = new double[p];
        for (var j = 0; j < p; j++)
        {
            theta[j] = z[j] * scale[j];
        }

        // One step of refinement: the residual of the unfactored system, solved with the same factors.
        var residual = new double[m];
        var fitted = design.Fitted(theta);
        for (var i = 0; i < n; i++)
        {
            residual[i] = sqrtW[i] * (design.Y[i] - fitted[i]);
        }

        for (var k = 0; k < ridge.Count; k++)
        {
            residual[n + k] = -ridge[k].Sum(e => e.Value * theta[e.Index]);
        }

        var dz = qr.Solve(residual);
        for (var j = 0; j < p; j++)
        {
            theta[j] += dz[j] * scale[j];
        }

        // Small problems are solved once more in double-double arithmetic directly in the user's raw basis,
        // so that an ill-conditioned raw polynomial loses no digits in the change of basis.
        double[]? beta = null;
        var method = "QR with column scaling and one refinement step";
        if ((long)m * p * p <= ExtendedPrecisionLimit)
        {
            beta = RawExtendedPrecision(design, fit.ClosedForm, m);
            method += ", then double-double QR in the raw basis";
        }

        return new Solution(SolveStatus.Optimal, theta, [], [], "built-in Householder QR", method, "closed form", clock.Elapsed.TotalSeconds, beta is null ? 2 : 3, "solved", beta);
    }

    private static double[] RawExtendedPrecision(Design.Design design, LeastSquaresForm ls, int m)
    {
        var (a, scale) = RawScaledColumns(design, ls.RidgeRaw, m);
        var n = design.Rows;
        var b = new DoubleDouble[m];
        for (var i = 0; i < n; i++)
        {
            b[i] = DoubleDouble.Sqrt(design.Weight(i)) * design.Y[i];
        }

        var z = DoubleDoubleLeastSquares.Solve(a, b);
        return z.Select((v, j) => v.Value * scale[j]).ToArray();
    }

    /// <summary>
    /// The weighted raw-basis columns √w·x_j in double-double (computed powers carry their rounding error), with
    /// the ridge rows below, each scaled by a power of two near 1/‖column‖: A_raw = A · diag(1/scale).
    /// </summary>
    internal static (DoubleDouble[][] Columns, double[] Scale) RawScaledColumns(Design.Design design, IReadOnlyList<Design.Entry[]> ridgeRaw, int m)
    {
        var n = design.Rows;
        var p = design.P;
        var sqrtW = new DoubleDouble[n];
        for (var i = 0; i < n; i++)
        {
            sqrtW[i] = DoubleDouble.Sqrt(design.Weight(i));
        }

        var a = new DoubleDouble[p][];
        var scale = new double[p];
        for (var j = 0; j < p; j++)
        {
            var col = new DoubleDouble[m];
            var hi = design.RawX[j];
            var lo = design.RawXLow[j];
            double norm2 = 0;
            for (var i = 0; i < n; i++)
            {
                col[i] = sqrtW[i] * new DoubleDouble(hi[i], lo?[i] ?? 0);
                norm2 += col[i].Hi * col[i].Hi;
            }

            for (var k = 0; k < ridgeRaw.Count; k++)
            {
                foreach (var e in ridgeRaw[k])
                {
                    if (e.Index == j)
                    {
                        col[n + k] += e.Value;
                    }
                }

                norm2 += col[n + k].Hi * col[n + k].Hi;
            }

            // A power-of-two scale is exact, so it changes nothing but the exponents.
            scale[j] = norm2 > 0 ? Math.ScaleB(1, -(int)Math.Round(Math.Log2(Math.Sqrt(norm2)))) : 1;
            for (var i = 0; i < m; i++)
            {
                col[i] *= scale[j];
            }

            a[j] = col;
        }

        return (a, scale);
    }

    internal static double Norm(double[] v, int from)
    {
        // Scaled sum of squares: no overflow or underflow for extreme columns.
        double scale = 0, ssq = 1;
        for (var i = from; i < v.Length; i++)
        {
            var x = Math.Abs(v[i]);
            if (x == 0)
            {
                continue;
            }

            if (scale < x)
            {
                ssq = 1 + ssq * (scale / x) * (scale / x);
                scale = x;
            }
            else
            {
                ssq += (x / scale) * (x / scale);
            }
        }

        return scale * Math.Sqrt(ssq);
    }
}

/// <summary>A Householder QR of a column-stored matrix, keeping the reflectors to apply Q' to new vectors.</summary>
internal sealed class Householder
{
    private readonly double[][] _v;
    private readonly double[] _beta;
    private readonly double[,] _r;
    private readonly int _m;

    private Householder(double[][] v, double[] beta, double[,] r, int m)
    {
        _v = v;
        _beta = beta;
        _r = r;
        _m = m;
    }

    /// <summary>Factors in place: the columns are overwritten by the reflectors.</summary>
    public static Householder Factor(double[][] columns)
    {
        var p = columns.Length;
        var m = columns[0].Length;
        var beta = new double[p];
        var r = new double[p, p];
        for (var k = 0; k < p; k++)
        {
            var v = columns[k];
            var alpha = QrLeastSquares.Norm(v, k);
            if (alpha == 0)
            {
                beta[k] = 0;
                r[k, k] = 0;
                continue;
            }

            if (v[k] > 0)
            {
                alpha = -alpha;
            }

            // v = x - alpha e_k, H = I - beta v v'.
            v[k] -= alpha;
            double vtv = 0;
            for (var i = k; i < m; i++)
            {
                vtv += v[i] * v[i];
            }

            beta[k] = 2 / vtv;
            r[k, k] = alpha;
            for (var j = k + 1; j < p; j++)
            {
                var c = columns[j];
                double dot = 0;
                for (var i = k; i < m; i++)
                {
                    dot += v[i] * c[i];
                }

                dot *= beta[k];
                for (var i = k; i < m; i++)
                {
                    c[i] -= dot * v[i];
                }

                r[k, j] = c[k];
            }
        }

        return new Householder(columns, beta, r, m);
    }

    /// <summary>The triangular factor R (upper triangle; Q'A = R).</summary>
    public double R(int row, int column) => _r[row, column];

    /// <summary>First column whose diagonal of R is negligible against the largest, or -1.</summary>
    public int DeficientColumn(double tolerance)
    {
        var p = _beta.Length;
        double max = 0;
        for (var k = 0; k < p; k++)
        {
            max = Math.Max(max, Math.Abs(_r[k, k]));
        }

        for (var k = 0; k < p; k++)
        {
            if (Math.Abs(_r[k, k]) <= tolerance * max || max == 0)
            {
                return k;
            }
        }

        return -1;
    }

    /// <summary>Least-squares solution of the factored system for right-hand side b.</summary>
    public double[] Solve(double[] b)
    {
        var p = _beta.Length;
        var y = (double[])b.Clone();
        for (var k = 0; k < p; k++)
        {
            var v = _v[k];
            double dot = 0;
            for (var i = k; i < _m; i++)
            {
                dot += v[i] * y[i];
            }

            dot *= _beta[k];
            for (var i = k; i < _m; i++)
            {
                y[i] -= dot * v[i];
            }
        }

        var z = new double[p];
        for (var k = p - 1; k >= 0; k--)
        {
            var s = y[k];
            for (var j = k + 1; j < p; j++)
            {
                s -= _r[k, j] * z[j];
            }

            z[k] = s / _r[k, k];
        }

        return z;
    }
}
