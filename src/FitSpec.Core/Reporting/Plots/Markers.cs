using OxyPlot;
using OxyPlot.Series;

namespace FitSpec.Reporting.Plots;

/// <summary>Scatter series of the drawn rows, with the largest residuals kept apart for their own colour.</summary>
internal static class Markers
{
    public static (List<ScatterPoint> Plain, List<ScatterPoint> Marked) Split(SeriesView view, Func<int, ScatterPoint> point, bool markLargest = true)
    {
        ArgumentNullException.ThrowIfNull(view);
        ArgumentNullException.ThrowIfNull(point);
        var plain = new List<ScatterPoint>(view.Drawn.Indices.Length);
        var marked = new List<ScatterPoint>();
        foreach (var i in view.Drawn.Indices)
        {
            (markLargest && view.MarkedRows.Contains(i) ? marked : plain).Add(point(i));
        }

        return (plain, marked);
    }

    public static ScatterSeries Series(string title, List<ScatterPoint> points, OxyColor color, MarkerType marker = MarkerType.Circle)
    {
        var series = new ScatterSeries
        {
            Title = PlotText.Label(title),
            MarkerType = marker,
            MarkerSize = points.Count > 500 ? 2 : 3,
            MarkerFill = color,
            MarkerStroke = OxyColors.Undefined,
        };
        series.Points.AddRange(points);
        return series;
    }
}
