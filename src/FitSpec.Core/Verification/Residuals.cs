namespace FitSpec.Verification;

/// <summary>
/// Residuals y - Σ β_j φ_j(x) from the raw coefficients and raw basis columns, summed with error-free
/// transformations (FMA products, two-sum) so that cancellation in ill-conditioned bases does not
/// corrupt the check.
/// </summary>
internal static class Residuals
{
    public static double[] FromRaw(double[] y, double[][] rawX, double[]?[] rawLow, ReadOnlySpan<double> beta)
    {
        var n = y.Length;
        var e = new double[n];
        for (var i = 0; i < n; i++)
        {
            double hi = y[i], lo = 0;
            for (var j = 0; j < rawX.Length; j++)
            {
                var prod = -beta[j] * rawX[j][i];
                var prodErr = Math.FusedMultiplyAdd(-beta[j], rawX[j][i], -prod);
                var sum = hi + prod;
                var bb = sum - hi;
                var sumErr = (hi - (sum - bb)) + (prod - bb);
                hi = sum;
                lo += sumErr + prodErr;
                if (rawLow[j] is { } low)
                {
                    lo -= beta[j] * low[i];
                }
            }

            e[i] = hi + lo;
        }

        return e;
    }
}
