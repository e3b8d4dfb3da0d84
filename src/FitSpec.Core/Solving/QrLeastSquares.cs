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

    private const int RefinementSteps = 2;

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
            throw new FitSpecException(new Diagnostic(fit.Spec.File, fit.Spec.Model.Pos.Line, fit.Spec.Model.Pos.Column, "model.terms", $"{n} rows cannot determine {p} coefficients; add data, remove terms or add an l2 penalty"));
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

        // Refinement in the user's basis: the residual y - X_raw β is computed with error-free products and
        // sums, the correction solved with the same factors and mapped back through M. This keeps digits that
        // the change of basis would otherwise lose for ill-conditioned raw polynomials.
        var beta = design.ToRaw(theta);
        var ls = fit.ClosedForm;
        for (var step = 0; step < RefinementSteps; step++)
        {
            var e = Verification.Residuals.FromRaw(design.Y, design.RawX, beta);
            var r = new double[m];
            for (var i = 0; i < n; i++)
            {
                r[i] = sqrtW[i] * e[i];
            }

            for (var k = 0; k < ls.RidgeRaw.Count; k++)
            {
                r[n + k] = -ls.RidgeRaw[k].Sqrt * beta[ls.RidgeRaw[k].Raw];
            }

            var dz = qr.Solve(r);
            var dTheta = new double[p];
            for (var j = 0; j < p; j++)
            {
                dTheta[j] = dz[j] * scale[j];
                theta[j] += dTheta[j];
            }

            var dBeta = design.ToRaw(dTheta);
            for (var j = 0; j < p; j++)
            {
                beta[j] += dBeta[j];
            }
        }

        return new Solution(SolveStatus.Optimal, theta, [], [], "built-in Householder QR", $"QR with column scaling, {RefinementSteps} refinement steps in the raw basis", "closed form", clock.Elapsed.TotalSeconds, 1 + RefinementSteps, "solved", beta);
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
