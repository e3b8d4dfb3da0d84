using FitSpec.Results;
using OxyPlot;
using OxyPlot.Annotations;
using OxyPlot.Axes;

namespace FitSpec.Reporting.Plots;

/// <summary>
/// Residuals against fitted values, around a zero line, with each guide (a loss's width, a residual band, a
/// barrier limit) as a dashed pair of lines at ±value. Structure left in the residuals shows up here.
/// </summary>
internal static class ResidualPlot
{
    public const string Key = "residuals";

    public static ReportPlot Build(SeriesView view, IReadOnlyList<ResidualGuide> guides)
    {
        ArgumentNullException.ThrowIfNull(view);
        ArgumentNullException.ThrowIfNull(guides);
        var s = view.Series;
        var model = PlotStyle.Model();
        var shown = guides.Where(g => double.IsFinite(g.Value)).ToList();

        // A symmetric range around zero that also holds every guide, so none falls outside the frame.
        var extent = view.Finite.Max(i => Math.Abs(s.Residuals[i]));
        foreach (var g in shown)
        {
            extent = Math.Max(extent, Math.Abs(g.Value));
        }

        extent = extent > 0 ? extent * 1.12 : 1;
        var y = PlotStyle.Axis(AxisPosition.Left, $"residual of {s.Response}");
        y.Minimum = -extent;
        y.Maximum = extent;
        model.Axes.Add(PlotStyle.Axis(AxisPosition.Bottom, $"fitted {s.Response}"));
        model.Axes.Add(y);

        model.Annotations.Add(new LineAnnotation
        {
            Type = LineAnnotationType.Horizontal,
            Y = 0,
            Color = PlotStyle.Reference,
            StrokeThickness = 1,
            LineStyle = LineStyle.Solid,
        });
        var right = view.Finite.Max(i => s.Fitted[i]);
        for (var k = 0; k < shown.Count; k++)
        {
            var g = shown[k];
            var color = PlotStyle.GuideColors[k % PlotStyle.GuideColors.Length];
            var v = Math.Abs(g.Value);
            foreach (var at in new[] { v, -v })
            {
                model.Annotations.Add(new LineAnnotation
                {
                    Type = LineAnnotationType.Horizontal,
                    Y = at,
                    Color = color,
                    StrokeThickness = 1.5,
                    LineStyle = LineStyle.Dash,
                });
            }

            // The label sits just above the upper line on a light box, so neither the line nor points run through it.
            model.Annotations.Add(new TextAnnotation
            {
                Text = $"{PlotText.Label(g.Label)} ±{PlotNumbers.Short(v)}",
                TextPosition = new DataPoint(right, v),
                TextHorizontalAlignment = OxyPlot.HorizontalAlignment.Right,
                TextVerticalAlignment = OxyPlot.VerticalAlignment.Bottom,
                Offset = new ScreenVector(0, -3),
                TextColor = color,
                FontSize = 11,
                Background = OxyColor.FromAColor(210, OxyColors.White),
                Stroke = OxyColors.Undefined,
                StrokeThickness = 0,
                Padding = new OxyThickness(2, 0, 2, 0),
            });
        }

        var (plain, marked) = Markers.Split(view, i => new OxyPlot.Series.ScatterPoint(s.Fitted[i], s.Residuals[i]));
        model.Series.Add(Markers.Series("residual", plain, PlotStyle.Points));
        if (marked.Count > 0)
        {
            model.Series.Add(Markers.Series("largest |residual|", marked, PlotStyle.Highlight));
        }

        var guideNote = shown.Count == 0
            ? ""
            : " Dashed lines: " + string.Join("; ", shown.Select(g => $"{PlotText.Label(g.Label)} at ±{PlotNumbers.Short(Math.Abs(g.Value))}")) + ".";
        var caption = $"Residuals (observed minus fitted {PlotText.Label(s.Response)}) against the fitted values."
            + guideNote + view.MarkedNote() + view.ThinningNote();
        var (file, inline) = SvgExport.Export(model, Key, $"residuals of {s.Response} against fitted values");
        return new ReportPlot(Key, "Residuals against fitted values", caption, file, inline);
    }
}
