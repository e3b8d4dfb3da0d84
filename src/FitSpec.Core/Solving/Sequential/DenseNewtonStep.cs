using FitSpec.Lowering;
using MathNet.Numerics.LinearAlgebra;

namespace FitSpec.Solving.Sequential;

/// <summary>
/// The Newton step of a fit with no constraints at all (no rows, no finite bounds, no variables beyond θ),
/// solved directly: (Q + X'DX) d = −∇F by Cholesky on the symmetrically (Jacobi) scaled matrix. Near a
/// barrier's limit the curvatures of the observations span many orders of magnitude; a direct solve of the
/// step keeps the digits that a QP solver's absolute tolerances on the whole model would lose.
/// </summary>
internal static class DenseNewtonStep
{
    public static bool Applies(FitProgram program) =>
        program.NumRows == 0
        && program.NumVars == program.CoefficientCount
        && program.Lower.All(double.IsNegativeInfinity)
        && program.Upper.All(double.IsPositiveInfinity)
        && !program.HasIntegers;

    /// <param name="slope">w_i φ'(e_i).</param>
    /// <param name="curvature">w_i times the model's curvature at e_i.</param>
    /// <returns>The step, or null where the matrix is not positive definite (the caller falls back to the QP).</returns>
    public static double[]? Solve(FitProgram program, Design.Design design, double[] x, double[] slope, double[] curvature)
    {
        var p = design.P;
        var n = design.Rows;
        var h = Matrix<double>.Build.Dense(p, p);
        var qx = program.HessianTimes(x);
        var g = new double[p];
        for (var j = 0; j < program.QStart.Length - 1; j++)
        {
            for (var k = program.QStart[j]; k < program.QStart[j + 1]; k++)
            {
                var i = program.QIndex[k];
                h[i, j] += program.QValue[k];
                if (i != j)
                {
                    h[j, i] += program.QValue[k];
                }
            }
        }

        for (var u = 0; u < p; u++)
        {
            var xu = design.X[u];
            double gu = program.Cost[u] + qx[u];
            for (var i = 0; i < n; i++)
            {
                gu -= slope[i] * xu[i];
            }

            g[u] = gu;
            for (var v = 0; v <= u; v++)
            {
                var xv = design.X[v];
                double s = 0;
                for (var i = 0; i < n; i++)
                {
                    s += curvature[i] * xu[i] * xv[i];
                }

                h[u, v] += s;
                if (u != v)
                {
                    h[v, u] += s;
                }
            }
        }

        var d = new double[p];
        for (var j = 0; j < p; j++)
        {
            if (!(h[j, j] > 0) || !double.IsFinite(h[j, j]))
            {
                return null;
            }

            d[j] = 1 / Math.Sqrt(h[j, j]);
        }

        var scaled = Matrix<double>.Build.Dense(p, p, (i, j) => d[i] * h[i, j] * d[j]);
        var rhs = Vector<double>.Build.Dense(p, i => -d[i] * g[i]);
        Vector<double> step;
        try
        {
            step = scaled.Cholesky().Solve(rhs);
        }
        catch (ArgumentException)
        {
            // Not positive definite (e.g. collinear columns): the QP solver copes with a semidefinite model.
            return null;
        }

        var result = new double[p];
        for (var j = 0; j < p; j++)
        {
            result[j] = d[j] * step[j];
            if (!double.IsFinite(result[j]))
            {
                return null;
            }
        }

        return result;
    }
}
