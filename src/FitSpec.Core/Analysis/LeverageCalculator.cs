using FitSpec.Results;

namespace FitSpec.Analysis;

/// <summary>
/// Leverage h_ii = diagonal of the weighted hat matrix √W X (X'WX)⁻¹ X' √W, from a QR of √W X in the internal
/// (centred, scaled) basis: h_i = ‖R⁻ᵀ a_i‖². The rows' own influence on their fitted values.
/// </summary>
public static class LeverageCalculator
{
    private const int Shown = 10;

    public static LeverageSummary? Compute(Design.Design design)
    {
        ArgumentNullException.ThrowIfNull(design);
        if (Values(design) is not { } h)
        {
            return null;
        }

        var n = design.Rows;
        var highest = Enumerable.Range(0, n)
            .OrderByDescending(i => h[i]).ThenBy(i => i)
            .Take(Shown)
            .Select(i => new LeverageRow(i + 1, design.Table.Lines[i], h[i]))
            .ToList();
        var mean = (double)design.P / n;
        return new LeverageSummary(mean, 2 * mean, highest);
    }

    /// <summary>Every row's leverage, or null when the design does not determine the coefficients.</summary>
    internal static double[]? Values(Design.Design design)
    {
        var n = design.Rows;
        var p = design.P;
        if (n <= p || p == 0 || InternalTriangle.Factor(design) is not { } r)
        {
            return null;
        }

        var h = new double[n];
        var u = new double[p];
        for (var i = 0; i < n; i++)
        {
            // Forward substitution R'u = a_i.
            var sw = Math.Sqrt(design.Weight(i));
            double sum = 0;
            for (var k = 0; k < p; k++)
            {
                var s = sw * design.X[k][i];
                for (var j = 0; j < k; j++)
                {
                    s -= r[j, k] * u[j];
                }

                u[k] = s / r[k, k];
                sum += u[k] * u[k];
            }

            h[i] = sum;
        }

        return h;
    }
}
