using MathNet.Numerics.Distributions;
using OxyPlot;
using OxyPlot.Axes;
using OxyPlot.Series;

namespace FitSpec.Reporting.Plots;

/// <summary>
/// Sorted residuals against standard normal quantiles, for least-squares fits, whose standard errors assume
/// roughly normal errors. Points near the line through the quartiles look normal; bends at the ends show heavy
/// or light tails, an S shape skew.
/// </summary>
internal static class NormalQuantilePlot
{
    public const string Key = "qq";

    /// <summary>Fewer residuals than this say nothing about a distribution's shape.</summary>
    public const int MinRows = 3;

    public static ReportPlot? Build(SeriesView view)
    {
        ArgumentNullException.ThrowIfNull(view);
        var s = view.Series;
        var sorted = view.Finite.Select(i => s.Residuals[i]).Order().ToArray();
        var n = sorted.Length;
        if (n < MinRows)
        {
            return null;
        }

        var model = PlotStyle.Model();
        model.Axes.Add(PlotStyle.Axis(AxisPosition.Bottom, "standard normal quantile"));
        model.Axes.Add(PlotStyle.Axis(AxisPosition.Left, $"residual of {s.Response} (sorted)"));

        // Blom's plotting positions (i − 3/8)/(n + 1/4), i = 1..n.
        double Z(int i) => Normal.InvCDF(0, 1, (i + 1 - 0.375) / (n + 0.25));

        var q1 = Quantile(sorted, 0.25);
        var q3 = Quantile(sorted, 0.75);
        var z1 = Normal.InvCDF(0, 1, 0.25);
        var z3 = Normal.InvCDF(0, 1, 0.75);
        var slope = (q3 - q1) / (z3 - z1);
        var intercept = q1 - (slope * z1);
        var zLow = Z(0);
        var zHigh = Z(n - 1);
        var reference = new LineSeries { Title = "line through the quartiles", Color = PlotStyle.Reference, StrokeThickness = 1, LineStyle = LineStyle.Dash };
        reference.Points.Add(new DataPoint(zLow, intercept + (slope * zLow)));
        reference.Points.Add(new DataPoint(zHigh, intercept + (slope * zHigh)));
        model.Series.Add(reference);

        // Thinned in sorted order: the stride keeps the shape, the largest |residuals| keep both tails.
        var drawn = PointThinning.Select(sorted);
        var points = new List<ScatterPoint>(drawn.Indices.Length);
        foreach (var i in drawn.Indices)
        {
            points.Add(new ScatterPoint(Z(i), sorted[i]));
        }

        model.Series.Add(Markers.Series("residual", points, PlotStyle.Points));

        var caption = $"Sorted residuals of {PlotText.Label(s.Response)} against standard normal quantiles (Blom positions). "
            + "Points close to the dashed line through the quartiles are consistent with normal errors, which the classical standard errors assume."
            + SeriesView.ThinningNote(drawn);
        var (file, inline) = SvgExport.Export(model, Key, $"normal quantile plot of the residuals of {s.Response}");
        return new ReportPlot(Key, "Normal quantile plot of residuals", caption, file, inline);
    }

    /// <summary>Linear interpolation between order statistics at position p·(n − 1).</summary>
    internal static double Quantile(double[] sorted, double p)
    {
        ArgumentNullException.ThrowIfNull(sorted);
        var at = p * (sorted.Length - 1);
        var lo = (int)Math.Floor(at);
        var hi = Math.Min(lo + 1, sorted.Length - 1);
        return sorted[lo] + ((at - lo) * (sorted[hi] - sorted[lo]));
    }
}
