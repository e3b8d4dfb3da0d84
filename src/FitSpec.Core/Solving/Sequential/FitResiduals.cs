namespace FitSpec.Solving.Sequential;

/// <summary>
/// Residuals e = y − Xθ in the internal basis, each summed with error-free transformations (FMA products,
/// two-sum), so that e carries an error of order ε|e| rather than ε|y|. A barrier's value and slope depend on
/// limit − |e|, which a plain sum would leave with few correct digits when e sits close to the limit.
/// </summary>
internal static class FitResiduals
{
    public static double[] Of(Design.Design design, ReadOnlySpan<double> x)
    {
        var n = design.Rows;
        var p = design.P;
        var e = new double[n];
        for (var i = 0; i < n; i++)
        {
            double hi = design.Y[i], lo = 0;
            for (var j = 0; j < p; j++)
            {
                var prod = -x[j] * design.X[j][i];
                var prodErr = Math.FusedMultiplyAdd(-x[j], design.X[j][i], -prod);
                var sum = hi + prod;
                var back = sum - hi;
                lo += (hi - (sum - back)) + (prod - back) + prodErr;
                hi = sum;
            }

            e[i] = hi + lo;
        }

        return e;
    }
}
