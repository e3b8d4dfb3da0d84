using OxyPlot;
using OxyPlot.Axes;
using OxyPlot.Series;

namespace FitSpec.Reporting.Plots;

/// <summary>
/// The data and the fit. With one model input: observations and the fitted curve against that input. With
/// several: fitted against observed, with the line y = x that a perfect fit would lie on.
/// </summary>
internal static class FitPlot
{
    public const string Key = "fit";

    public static ReportPlot Build(SeriesView view)
    {
        ArgumentNullException.ThrowIfNull(view);
        return view.Input is { } x ? AgainstInput(view, x) : AgainstObserved(view);
    }

    private static ReportPlot AgainstInput(SeriesView view, double[] x)
    {
        var s = view.Series;
        var input = s.Input!;
        var model = PlotStyle.Model();
        model.Axes.Add(PlotStyle.Axis(AxisPosition.Bottom, input));
        model.Axes.Add(PlotStyle.Axis(AxisPosition.Left, s.Response));
        var (plain, marked) = Markers.Split(view, i => new ScatterPoint(x[i], s.Observed[i]));
        model.Series.Add(Markers.Series("observed", plain, PlotStyle.Points));
        if (marked.Count > 0)
        {
            model.Series.Add(Markers.Series("largest |residual|", marked, PlotStyle.Highlight));
        }

        var curve = Curve(s.CurveX, s.CurveY);
        string shows;
        if (curve.Count >= 2)
        {
            var line = new LineSeries { Title = "fitted curve", Color = PlotStyle.Curve, StrokeThickness = 2 };
            line.Points.AddRange(curve);
            model.Series.Add(line);
            shows = "the fitted curve";
        }
        else
        {
            // No curve on a grid: the fitted values at the rows still show the fit.
            var (fitted, _) = Markers.Split(view, i => new ScatterPoint(x[i], s.Fitted[i]), markLargest: false);
            model.Series.Add(Markers.Series("fitted", fitted, PlotStyle.Curve, MarkerType.Diamond));
            shows = "the fitted values at each row";
        }

        var caption = $"Observed {PlotText.Label(s.Response)} (points) and {shows} against {PlotText.Label(input)}." + view.MarkedNote() + view.ThinningNote();
        var (file, inline) = SvgExport.Export(model, Key, $"{s.Response} against {input}: observations and fit");
        return new ReportPlot(Key, "Observations and fit", caption, file, inline);
    }

    private static ReportPlot AgainstObserved(SeriesView view)
    {
        var s = view.Series;
        var model = PlotStyle.Model();
        model.Axes.Add(PlotStyle.Axis(AxisPosition.Bottom, $"observed {s.Response}"));
        model.Axes.Add(PlotStyle.Axis(AxisPosition.Left, $"fitted {s.Response}"));

        var low = double.PositiveInfinity;
        var high = double.NegativeInfinity;
        foreach (var i in view.Finite)
        {
            low = Math.Min(low, Math.Min(s.Observed[i], s.Fitted[i]));
            high = Math.Max(high, Math.Max(s.Observed[i], s.Fitted[i]));
        }

        var identity = new LineSeries { Title = "y = x", Color = PlotStyle.Reference, StrokeThickness = 1, LineStyle = LineStyle.Dash };
        identity.Points.Add(new DataPoint(low, low));
        identity.Points.Add(new DataPoint(high, high));
        model.Series.Add(identity);

        var (plain, marked) = Markers.Split(view, i => new ScatterPoint(s.Observed[i], s.Fitted[i]));
        model.Series.Add(Markers.Series("rows", plain, PlotStyle.Points));
        if (marked.Count > 0)
        {
            model.Series.Add(Markers.Series("largest |residual|", marked, PlotStyle.Highlight));
        }

        var caption = $"Fitted against observed {PlotText.Label(s.Response)}, one point per row; the model has several inputs, so no single curve is drawn. "
            + "Points on the dashed line y = x are fitted exactly." + view.MarkedNote() + view.ThinningNote();
        var (file, inline) = SvgExport.Export(model, Key, $"fitted against observed {s.Response}");
        return new ReportPlot(Key, "Fitted against observed", caption, file, inline);
    }

    private static List<DataPoint> Curve(double[]? cx, double[]? cy)
    {
        var points = new List<DataPoint>();
        if (cx is null || cy is null)
        {
            return points;
        }

        for (var i = 0; i < Math.Min(cx.Length, cy.Length); i++)
        {
            if (double.IsFinite(cx[i]) && double.IsFinite(cy[i]))
            {
                points.Add(new DataPoint(cx[i], cy[i]));
            }
        }

        return points;
    }
}
