using FitSpec.Lowering;

namespace FitSpec.Solving.Sequential;

/// <summary>
/// The first-order optimality residual of min F(x) = program objective(x) + loss(θ) subject to the
/// program's rows and bounds, at a point x with multipliers (y for rows, z for bounds, HiGHS's signs):
/// <list type="bullet">
/// <item>stationarity ‖∇F(x) − A'y − z‖∞, relative to the largest sum of magnitudes of the terms that
/// cancel in one component (|c_j| + |(Qx)_j| + Σ_i |∂loss_i/∂x_j| + Σ_r |A_rj y_r| + |z_j|, each loss term
/// sized at least as at a residual of <see cref="ResidualFloor"/>), so that it
/// reads as a fraction of what double precision can resolve and does not change when the data are scaled;</item>
/// <item>complementarity Σ |y_r|·(distance of row r from the bound its multiplier presses on), and the same
/// for bounds, relative to max(1, |F(x)|).</item>
/// </list>
/// The residual is the larger of the two. Dual signs (y ≥ 0 only on a finite lower bound, …) are the
/// subproblem solver's and are not re-checked here; the verification stage checks them on the last subproblem.
/// </summary>
internal static class Kkt
{
    /// <summary>
    /// A residual size, 1e-9 of the response's rms, below which a residual counts as zero when sizing the
    /// loss's gradient terms: where the data are fitted exactly the terms are rounding noise with no
    /// cancellation to measure, and each term's size is taken as at least the loss's slope at this residual.
    /// Real fits have residuals far above it, so their measure is unchanged.
    /// </summary>
    public static double ResidualFloor(Design.Design design)
    {
        ArgumentNullException.ThrowIfNull(design);
        double s = 0;
        foreach (var y in design.Y)
        {
            s += y * y;
        }

        var rms = Math.Sqrt(s / Math.Max(1, design.Rows));
        return 1e-9 * (rms > 0 ? rms : 1);
    }

    /// <param name="lossGradient">∂loss/∂θ_j at x.</param>
    /// <param name="lossMagnitude">Σ_i |∂loss_i/∂θ_j|, the size of the terms summed in lossGradient.</param>
    public static double Residual(FitProgram program, double[] x, double[] lossGradient, double[] lossMagnitude, double[] y, double[] z, double objective)
    {
        var qx = program.HessianTimes(x);
        double worst = 0, scale = 0;
        for (var j = 0; j < program.NumVars; j++)
        {
            var g = program.Cost[j] + qx[j] - z[j];
            var m = Math.Abs(program.Cost[j]) + Math.Abs(qx[j]) + Math.Abs(z[j]);
            if (j < lossGradient.Length)
            {
                g += lossGradient[j];
                m += lossMagnitude[j];
            }

            for (var k = program.ColStart[j]; k < program.ColStart[j + 1]; k++)
            {
                var t = program.Values[k] * y[program.RowIndex[k]];
                g -= t;
                m += Math.Abs(t);
            }

            worst = Math.Max(worst, Math.Abs(g));
            scale = Math.Max(scale, m);
        }

        var stationarity = scale > 0 ? worst / scale : 0;
        var activity = program.RowActivity(x);
        double slack = 0;
        for (var r = 0; r < program.NumRows; r++)
        {
            slack += Pressed(y[r], activity[r], program.RowLower[r], program.RowUpper[r]);
        }

        for (var j = 0; j < program.NumVars; j++)
        {
            slack += Pressed(z[j], x[j], program.Lower[j], program.Upper[j]);
        }

        return Math.Max(stationarity, slack / Math.Max(1, Math.Abs(objective)));
    }

    private static double Pressed(double multiplier, double value, double lower, double upper)
    {
        if (multiplier > 0)
        {
            return double.IsFinite(lower) ? multiplier * Math.Abs(value - lower) : 0;
        }

        if (multiplier < 0)
        {
            return double.IsFinite(upper) ? -multiplier * Math.Abs(upper - value) : 0;
        }

        return 0;
    }
}
