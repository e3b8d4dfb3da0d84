using FitSpec.Results;
using OxyPlot;
using OxyPlot.Annotations;
using OxyPlot.Axes;
using OxyPlot.Series;

namespace FitSpec.Reporting.Plots;

/// <summary>
/// How the residuals are spread: a histogram over every row (binning is cheap, so nothing is thinned), with the
/// loss's φ(r) on a second axis so one can see which residuals the loss weighs heavily.
/// </summary>
internal static class ResidualHistogram
{
    public const string Key = "histogram";

    public const int MinBins = 5;
    public const int MaxBins = 60;

    public static ReportPlot Build(SeriesView view, LossCurve? loss, IReadOnlyList<ResidualGuide> guides)
    {
        ArgumentNullException.ThrowIfNull(view);
        ArgumentNullException.ThrowIfNull(guides);
        var s = view.Series;
        var residuals = view.Finite.Select(i => s.Residuals[i]).ToArray();
        var bins = Bin(residuals);

        var model = PlotStyle.Model();
        model.Axes.Add(PlotStyle.Axis(AxisPosition.Bottom, $"residual of {s.Response}"));
        var counts = PlotStyle.Axis(AxisPosition.Left, "rows", "count");
        counts.Minimum = 0;
        counts.MinimumPadding = 0;
        model.Axes.Add(counts);

        var bars = new HistogramSeries
        {
            Title = "rows per bin",
            FillColor = PlotStyle.Bars,
            StrokeColor = PlotStyle.Points,
            StrokeThickness = 1,
            YAxisKey = "count",
        };
        foreach (var (low, high, count) in bins)
        {
            bars.Items.Add(new HistogramItem(low, high, count * (high - low), count));
        }

        model.Series.Add(bars);

        var curve = LossPoints(loss);
        if (curve.Count >= 2)
        {
            var phi = PlotStyle.Axis(AxisPosition.Right, $"φ(r), {loss!.Loss} loss", "phi");
            phi.MajorGridlineStyle = LineStyle.None;
            model.Axes.Add(phi);
            var line = new LineSeries { Title = $"φ(r) of {PlotText.Label(loss.Loss)}", Color = PlotStyle.Curve, StrokeThickness = 2, YAxisKey = "phi" };
            line.Points.AddRange(curve);
            model.Series.Add(line);
        }

        var shown = guides.Where(g => double.IsFinite(g.Value)).ToList();
        for (var k = 0; k < shown.Count; k++)
        {
            var color = PlotStyle.GuideColors[k % PlotStyle.GuideColors.Length];
            foreach (var at in new[] { Math.Abs(shown[k].Value), -Math.Abs(shown[k].Value) })
            {
                model.Annotations.Add(new LineAnnotation
                {
                    Type = LineAnnotationType.Vertical,
                    X = at,
                    Color = color,
                    StrokeThickness = 1.5,
                    LineStyle = LineStyle.Dash,
                    YAxisKey = "count",
                });
            }
        }

        var width = bins.Count > 0 ? bins[0].High - bins[0].Low : 0;
        var caption = string.Create(System.Globalization.CultureInfo.InvariantCulture,
            $"Residuals of all {residuals.Length:N0} rows in {bins.Count} bins of width {PlotNumbers.Short(width)}.")
            + (curve.Count >= 2 ? $" The line is the loss's penalty φ(r) of the {PlotText.Label(loss!.Loss)} loss (right axis)." : "")
            + (shown.Count > 0 ? " Dashed lines: " + string.Join("; ", shown.Select(g => $"{PlotText.Label(g.Label)} at ±{PlotNumbers.Short(Math.Abs(g.Value))}")) + "." : "");
        var (file, inline) = SvgExport.Export(model, Key, $"histogram of the residuals of {s.Response}");
        return new ReportPlot(Key, "Distribution of residuals", caption, file, inline);
    }

    /// <summary>Equal-width bins over the residual range; about 2·n^(1/3) of them, within [5, 60].</summary>
    internal static List<(double Low, double High, int Count)> Bin(double[] residuals)
    {
        ArgumentNullException.ThrowIfNull(residuals);
        var result = new List<(double, double, int)>();
        if (residuals.Length == 0)
        {
            return result;
        }

        var low = residuals.Min();
        var high = residuals.Max();
        if (!(high > low))
        {
            // Every residual equal (a perfect fit gives all zeros): a range around that value.
            var half = low == 0 ? 1 : Math.Abs(low) * 0.1;
            low -= half;
            high += half;
        }

        // The small allowance keeps a perfect cube (1000 rows: 20 bins) from rounding up to one bin more.
        var count = Math.Clamp((int)Math.Ceiling((2 * Math.Cbrt(residuals.Length)) - 1e-9), MinBins, MaxBins);
        var width = (high - low) / count;
        var tally = new int[count];
        foreach (var e in residuals)
        {
            tally[Math.Clamp((int)((e - low) / width), 0, count - 1)]++;
        }

        for (var k = 0; k < count; k++)
        {
            result.Add((low + (k * width), k == count - 1 ? high : low + ((k + 1) * width), tally[k]));
        }

        return result;
    }

    private static List<DataPoint> LossPoints(LossCurve? loss)
    {
        var points = new List<DataPoint>();
        if (loss is null)
        {
            return points;
        }

        for (var i = 0; i < Math.Min(loss.R.Length, loss.Phi.Length); i++)
        {
            if (double.IsFinite(loss.R[i]) && double.IsFinite(loss.Phi[i]))
            {
                points.Add(new DataPoint(loss.R[i], loss.Phi[i]));
            }
        }

        return points;
    }
}
