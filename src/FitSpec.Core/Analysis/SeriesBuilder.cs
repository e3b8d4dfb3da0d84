using FitSpec.Results;

namespace FitSpec.Analysis;

/// <summary>The per-row numbers of a solved fit, and its curve over the one input when there is one.</summary>
public static class SeriesBuilder
{
    /// <summary>Points on the fitted curve: enough for a smooth line through a cubic spline's knots.</summary>
    public const int CurvePoints = 241;

    public static ResidualSeries Build(Design.Design design, string response, double[] beta, double[] residuals)
    {
        ArgumentNullException.ThrowIfNull(design);
        ArgumentNullException.ThrowIfNull(beta);
        ArgumentNullException.ThrowIfNull(residuals);
        var n = design.Rows;
        var fitted = new double[n];
        for (var i = 0; i < n; i++)
        {
            fitted[i] = design.Y[i] - residuals[i];
        }

        string? input = null;
        double[]? inputValues = null, curveX = null, curveY = null;
        if (design.Inputs.Count == 1 && design.Table.Columns.TryGetValue(design.Inputs[0], out var column) && n > 0)
        {
            input = design.Inputs[0];
            inputValues = column;
            (curveX, curveY) = Curve(design, input, column, beta);
        }

        return new ResidualSeries(response, input, inputValues, design.Y, fitted, residuals, design.Table.Lines, curveX, curveY);
    }

    private static (double[]? X, double[]? Y) Curve(Design.Design design, string input, double[] values, double[] beta)
    {
        var lo = values.Min();
        var hi = values.Max();
        if (!double.IsFinite(lo) || !double.IsFinite(hi))
        {
            return (null, null);
        }

        var count = hi > lo ? CurvePoints : 1;
        var x = new double[count];
        var y = new double[count];
        var point = new Dictionary<string, double>(StringComparer.Ordinal);
        for (var k = 0; k < count; k++)
        {
            x[k] = count == 1 ? lo : lo + ((hi - lo) * k / (count - 1));
            point[input] = x[k];
            var phi = design.Basis.At(point, null);
            double s = 0;
            for (var j = 0; j < beta.Length; j++)
            {
                s += beta[j] * phi[j].Value;
            }

            y[k] = s;
        }

        return (x, y);
    }
}
