using FitSpec.Solving;

namespace FitSpec.Analysis;

/// <summary>
/// The triangular factor R of √W X in the internal (centred, scaled) basis, R'R = X'WX — what leverage and
/// standard errors are read from. Small designs get a Householder QR of a copy; large ones (more than
/// CopyLimit entries) a Cholesky factor of X'WX accumulated in one pass, so no copy of the design is made
/// (the internal basis keeps X'WX well conditioned; these are diagnostics, not the fit).
/// </summary>
internal static class InternalTriangle
{
    public const long CopyLimit = 2_000_000;

    /// <returns>R as [row, column], or null when the design does not determine every coefficient.</returns>
    public static double[,]? Factor(Design.Design design)
    {
        var n = design.Rows;
        var p = design.P;
        return (long)n * p <= CopyLimit ? ByQr(design, n, p) : ByGram(design, n, p);
    }

    private static double[,]? ByQr(Design.Design design, int n, int p)
    {
        var columns = new double[p][];
        for (var j = 0; j < p; j++)
        {
            var col = new double[n];
            var x = design.X[j];
            for (var i = 0; i < n; i++)
            {
                col[i] = Math.Sqrt(design.Weight(i)) * x[i];
            }

            columns[j] = col;
        }

        var qr = Householder.Factor(columns);
        if (qr.DeficientColumn(1e-11) >= 0)
        {
            return null;
        }

        var r = new double[p, p];
        for (var k = 0; k < p; k++)
        {
            for (var j = k; j < p; j++)
            {
                r[k, j] = qr.R(k, j);
            }
        }

        return r;
    }

    private static double[,]? ByGram(Design.Design design, int n, int p)
    {
        var g = new double[p, p];
        for (var a = 0; a < p; a++)
        {
            var xa = design.X[a];
            for (var b = a; b < p; b++)
            {
                var xb = design.X[b];
                double s = 0;
                for (var i = 0; i < n; i++)
                {
                    s += design.Weight(i) * xa[i] * xb[i];
                }

                g[a, b] = s;
            }
        }

        // Cholesky G = R'R, upper R; a pivot at rounding level means a dependent column.
        var r = new double[p, p];
        double largest = 0;
        for (var k = 0; k < p; k++)
        {
            largest = Math.Max(largest, g[k, k]);
        }

        for (var k = 0; k < p; k++)
        {
            var d = g[k, k];
            for (var m = 0; m < k; m++)
            {
                d -= r[m, k] * r[m, k];
            }

            if (d <= 1e-22 * largest)
            {
                return null;
            }

            r[k, k] = Math.Sqrt(d);
            for (var j = k + 1; j < p; j++)
            {
                var s = g[k, j];
                for (var m = 0; m < k; m++)
                {
                    s -= r[m, k] * r[m, j];
                }

                r[k, j] = s / r[k, k];
            }
        }

        return r;
    }
}
