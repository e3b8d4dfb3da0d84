using System.Globalization;
using System.Xml.Linq;
using FitSpec.Reporting.Plots;
using FitSpec.Results;

namespace FitSpec.Tests.Reporting;

/// <summary>Which plots a result gets, and what their SVG holds. Data are made up (see SampleSeries).</summary>
public sealed class PlotTests
{
    private static readonly XNamespace Svg = "http://www.w3.org/2000/svg";

    private static FitResult WithLoss(FitResult result, string loss) => result with { Statement = result.Statement! with { Loss = loss } };

    private static IEnumerable<string> Texts(ReportPlot plot) =>
        XDocument.Parse(plot.FileSvg).Descendants(Svg + "text").Select(t => t.Value);

    [Fact]
    public void Each_plot_appears_only_when_its_data_is_there()
    {
        Assert.Empty(ReportPlots.Build(SampleResults.Optimal()));
        Assert.Empty(ReportPlots.Build(SampleResults.Invalid() with { Series = SampleSeries.Line(10) }));

        var robust = ReportPlots.Build(SampleSeries.Full(WithLoss(SampleResults.Optimal(), "huber (width = 0.004)")));
        Assert.Equal(["fit", "residuals", "histogram"], robust.Select(p => p.Key));

        var leastSquares = ReportPlots.Build(SampleSeries.Full(WithLoss(SampleResults.Optimal(), "l2")));
        Assert.Equal(["fit", "residuals", "histogram", "qq"], leastSquares.Select(p => p.Key));

        // A series whose every row has a non-finite value gives nothing to draw.
        var broken = SampleSeries.Line(5) with { Residuals = [double.NaN, double.NaN, double.NaN, double.NaN, double.NaN] };
        Assert.Empty(ReportPlots.Build(SampleResults.Optimal() with { Series = broken }));
    }

    [Fact]
    public void Fit_plot_draws_the_curve_against_the_one_input_with_column_names_on_the_axes()
    {
        var plot = ReportPlots.Build(SampleSeries.Full()).Single(p => p.Key == "fit");

        Assert.Equal("Observations and fit", plot.Title);
        var texts = Texts(plot).ToList();
        Assert.Contains("load_kg", texts);
        Assert.Contains("reading_mv", texts);
        Assert.Contains("fitted curve", texts);
        Assert.Contains("against load_kg", plot.Caption, StringComparison.Ordinal);
        // The curve: one polyline with the 101 grid points.
        Assert.Contains(XDocument.Parse(plot.FileSvg).Descendants(Svg + "polyline"),
            p => ((string?)p.Attribute("points"))?.Split(' ').Length == 101);
    }

    [Fact]
    public void With_several_inputs_the_fit_plot_is_fitted_against_observed_with_the_identity_line()
    {
        var result = SampleSeries.Full(series: SampleSeries.Line(30, input: null));
        var plot = ReportPlots.Build(result).Single(p => p.Key == "fit");

        Assert.Equal("Fitted against observed", plot.Title);
        var texts = Texts(plot).ToList();
        Assert.Contains("observed reading_mv", texts);
        Assert.Contains("fitted reading_mv", texts);
        Assert.Contains("y = x", texts);
    }

    [Fact]
    public void Residual_plot_draws_each_guide_as_a_labelled_dashed_pair()
    {
        var result = SampleSeries.Full() with { Guides = [new ResidualGuide("huber width", 0.004), new ResidualGuide("barrier limit", 0.03)] };
        var plot = ReportPlots.Build(result).Single(p => p.Key == "residuals");

        var texts = Texts(plot).ToList();
        Assert.Contains("huber width ±0.004", texts);
        Assert.Contains("barrier limit ±0.03", texts);
        Assert.Contains("residual of reading_mv", texts);
        Assert.Contains("fitted reading_mv", texts);
        var dashed = XDocument.Parse(plot.FileSvg).Descendants(Svg + "polyline")
            .Count(p => ((string?)p.Attribute("style"))?.Contains("stroke-dasharray", StringComparison.Ordinal) == true);
        Assert.Equal(4, dashed);
        Assert.Contains("huber width at ±0.004", plot.Caption, StringComparison.Ordinal);

        var none = ReportPlots.Build(SampleSeries.Full() with { Guides = [] }).Single(p => p.Key == "residuals");
        Assert.DoesNotContain("stroke-dasharray", none.FileSvg, StringComparison.Ordinal);
    }

    [Fact]
    public void Code_marks_in_guide_labels_are_dropped_from_plot_text()
    {
        var result = SampleSeries.Full() with { Guides = [new ResidualGuide("band of `|residual| <= 0.1`", 0.1)] };
        var plot = ReportPlots.Build(result).Single(p => p.Key == "residuals");

        Assert.Contains("band of |residual| <= 0.1 ±0.1", Texts(plot));
        Assert.Contains("band of |residual| <= 0.1 at ±0.1", plot.Caption, StringComparison.Ordinal);
        Assert.DoesNotContain("`", plot.FileSvg, StringComparison.Ordinal);
    }

    [Fact]
    public void Text_is_measured_in_managed_code_from_built_in_metrics()
    {
        // No native calls anywhere in the plotting package: nothing can reach for system fonts, so a machine
        // without any font lays out the same SVG.
        var native = typeof(OxyPlot.PlotModel).Assembly.GetTypes()
            .SelectMany(t => t.GetMethods(System.Reflection.BindingFlags.Public | System.Reflection.BindingFlags.NonPublic
                | System.Reflection.BindingFlags.Static | System.Reflection.BindingFlags.Instance | System.Reflection.BindingFlags.DeclaredOnly))
            .Where(m => (m.Attributes & System.Reflection.MethodAttributes.PinvokeImpl) != 0)
            .Select(m => m.DeclaringType + "." + m.Name);
        Assert.Empty(native);

        var measurer = new TextMeasurer();
        var latin = measurer.MeasureText("load_kg", SvgExport.Font, 12, 400);
        var greek = measurer.MeasureText("φφφφφφφ", SvgExport.Font, 12, 400);
        Assert.InRange(latin.Width, 40, 80);
        Assert.InRange(latin.Height, 12, 20);
        Assert.True(greek.Width > 30, $"characters outside the metrics still take room: {greek.Width}");
    }

    [Fact]
    public void Histogram_overlays_the_loss_curve_on_a_second_axis_only_when_given()
    {
        var with = ReportPlots.Build(SampleSeries.Full()).Single(p => p.Key == "histogram");
        Assert.Contains("φ(r), huber loss", Texts(with));
        Assert.Contains("φ(r)", with.Caption, StringComparison.Ordinal);

        var without = ReportPlots.Build(SampleSeries.Full() with { LossCurve = null }).Single(p => p.Key == "histogram");
        Assert.DoesNotContain(Texts(without), t => t.Contains('φ', StringComparison.Ordinal));
        Assert.Contains("rows", Texts(without));
    }

    [Fact]
    public void Histogram_bins_hold_every_residual()
    {
        var residuals = SampleSeries.Line(1000, outliers: [3, 500]).Residuals;
        var bins = ResidualHistogram.Bin(residuals);
        Assert.Equal(1000, bins.Sum(b => b.Count));
        Assert.Equal(20, bins.Count); // 2·1000^(1/3) = 20
        Assert.Equal(residuals.Min(), bins[0].Low);
        Assert.Equal(residuals.Max(), bins[^1].High);

        var flat = ResidualHistogram.Bin([0.0, 0.0, 0.0]);
        Assert.Equal(3, flat.Sum(b => b.Count));
        Assert.True(flat[0].Low < 0 && flat[^1].High > 0);
    }

    [Fact]
    public void Quantiles_interpolate_between_order_statistics()
    {
        // Check values: the default sample quantile (linear interpolation at p·(n − 1), "type 7" of Hyndman and
        // Fan, 1996, The American Statistician 50(4)); e.g. the lower quartile of 1, 2, 3, 4 is 1.75.
        Assert.Equal(1.75, NormalQuantilePlot.Quantile([1, 2, 3, 4], 0.25), 12);
        Assert.Equal(3.25, NormalQuantilePlot.Quantile([1, 2, 3, 4], 0.75), 12);
        Assert.Equal(2.5, NormalQuantilePlot.Quantile([1, 2, 3, 4], 0.5), 12);
    }

    [Fact]
    public void Svg_has_a_fixed_size_and_ids_no_other_plot_uses()
    {
        var plots = ReportPlots.Build(SampleSeries.Full(WithLoss(SampleResults.Optimal(), "l2")));
        var ids = new List<string>();
        foreach (var plot in plots)
        {
            var root = XDocument.Parse(plot.FileSvg).Root!;
            Assert.Equal(Svg + "svg", root.Name);
            Assert.Equal("760", (string?)root.Attribute("width"));
            Assert.Equal("430", (string?)root.Attribute("height"));
            Assert.Equal("0 0 760 430", (string?)root.Attribute("viewBox"));
            ids.AddRange(root.Descendants().Select(e => (string?)e.Attribute("id")).OfType<string>());

            Assert.StartsWith("<svg width=\"760\" height=\"430\" viewBox=\"0 0 760 430\"", plot.InlineSvg, StringComparison.Ordinal);
            Assert.DoesNotContain("xmlns", plot.InlineSvg, StringComparison.Ordinal);
            Assert.DoesNotContain("<?xml", plot.FileSvg, StringComparison.Ordinal);
            Assert.DoesNotContain("\r", plot.FileSvg, StringComparison.Ordinal);
        }

        Assert.NotEmpty(ids);
        Assert.Equal(ids.Count, ids.Distinct().Count());
    }

    [Fact]
    public void Svg_is_byte_identical_for_the_same_result_whatever_the_culture()
    {
        var result = SampleSeries.Full(WithLoss(SampleResults.Optimal(), "l2"), SampleSeries.Line(3000, outliers: [11, 2500]));
        var first = ReportPlots.Build(result);
        var again = ReportPlots.Build(result);
        Assert.Equal(first.Select(p => p.FileSvg), again.Select(p => p.FileSvg));
        Assert.Equal(first.Select(p => p.InlineSvg), again.Select(p => p.InlineSvg));
        Assert.Equal(first.Select(p => p.Caption), again.Select(p => p.Caption));

        var comma = (CultureInfo)CultureInfo.InvariantCulture.Clone();
        comma.NumberFormat.NumberDecimalSeparator = ",";
        comma.NumberFormat.NumberGroupSeparator = ".";
        comma.NumberFormat.NegativeSign = "~";
        var saved = CultureInfo.CurrentCulture;
        try
        {
            CultureInfo.CurrentCulture = comma;
            var other = ReportPlots.Build(result);
            Assert.Equal(first.Select(p => p.FileSvg), other.Select(p => p.FileSvg));
            Assert.Equal(first.Select(p => p.Caption), other.Select(p => p.Caption));
        }
        finally
        {
            CultureInfo.CurrentCulture = saved;
        }
    }

    [Fact]
    public void Hostile_column_names_stay_text_in_the_svg()
    {
        var attack = SampleResults.Attack;
        var series = SampleSeries.Line(20, response: attack, input: attack + "\u0001\n\"'&");
        var result = SampleSeries.Full(WithLoss(SampleResults.Optimal(), "l2"), series) with
        {
            Guides = [new ResidualGuide(attack, 0.01)],
            LossCurve = SampleSeries.Huber(0.004) with { Loss = attack },
        };

        var plots = ReportPlots.Build(result);
        Assert.Equal(4, plots.Count);
        foreach (var plot in plots)
        {
            Assert.DoesNotContain("<script", plot.FileSvg, StringComparison.OrdinalIgnoreCase);
            Assert.DoesNotContain("<script", plot.InlineSvg, StringComparison.OrdinalIgnoreCase);
            // Well-formed, and the name reads back as the user wrote it.
            var doc = XDocument.Parse(plot.FileSvg);
            Assert.Contains(doc.Descendants(Svg + "text"), t => t.Value.Contains(attack, StringComparison.Ordinal));
            Assert.Contains(attack, (string?)doc.Root!.Attribute("aria-label"), StringComparison.Ordinal);
        }
    }

    [Fact]
    public void Thinning_keeps_at_most_the_budget_in_data_order_and_always_the_largest_residuals()
    {
        var residuals = new double[100_000];
        for (var i = 0; i < residuals.Length; i++)
        {
            residuals[i] = Math.Sin(i * 0.37) * 1e-3;
        }

        residuals[77_777] = -5; // off the stride
        residuals[12_345] = 4;
        residuals[31] = double.NaN;

        var rows = PointThinning.Select(residuals);
        Assert.True(rows.IsThinned);
        Assert.Equal(100_000, rows.Total);
        Assert.True(rows.Indices.Length <= PointThinning.MaxPoints, $"{rows.Indices.Length} points");
        Assert.True(rows.Indices.Length >= PointThinning.MaxPoints - PointThinning.LargestKept);
        Assert.Contains(77_777, rows.Indices);
        Assert.Contains(12_345, rows.Indices);
        Assert.Equal(rows.Indices.Order(), rows.Indices);
        Assert.Equal(rows.Indices.Length, rows.Indices.Distinct().Count());
        Assert.Equal(rows.Indices, PointThinning.Select(residuals).Indices);

        // Every row of the largest-|e| hundred is kept.
        var largest = Enumerable.Range(0, residuals.Length).Where(i => !double.IsNaN(residuals[i]))
            .OrderByDescending(i => Math.Abs(residuals[i])).ThenBy(i => i).Take(PointThinning.LargestKept);
        Assert.All(largest, i => Assert.Contains(i, rows.Indices));

        var small = PointThinning.Select([1.0, -2.0, 3.0]);
        Assert.False(small.IsThinned);
        Assert.Equal([0, 1, 2], small.Indices);
    }

    [Fact]
    public void A_hundred_thousand_rows_make_small_plots_quickly_and_say_they_are_thinned()
    {
        var series = SampleSeries.Line(100_000, outliers: [99_991]);
        var result = SampleSeries.Full(WithLoss(SampleResults.Optimal(), "l2"), series);
        var clock = System.Diagnostics.Stopwatch.StartNew();
        var plots = ReportPlots.Build(result);
        clock.Stop();

        Assert.Equal(4, plots.Count);
        Assert.True(clock.Elapsed < TimeSpan.FromSeconds(10), $"took {clock.Elapsed}");
        foreach (var plot in plots)
        {
            Assert.True(plot.FileSvg.Length < 300_000, $"{plot.Key}: {plot.FileSvg.Length} characters");
        }

        var fit = plots.Single(p => p.Key == "fit");
        Assert.Contains("of 100,000 rows are drawn", fit.Caption, StringComparison.Ordinal);
        Assert.Contains("of 100,000 rows are drawn", plots.Single(p => p.Key == "qq").Caption, StringComparison.Ordinal);
        Assert.Contains("all 100,000 rows", plots.Single(p => p.Key == "histogram").Caption, StringComparison.Ordinal);

        // The planted outlier is among the rows drawn and marked.
        var view = SeriesView.Of(series)!;
        Assert.Contains(99_991, view.Drawn.Indices);
        Assert.Contains(99_991, view.MarkedRows);
        Assert.True(view.Drawn.Indices.Length <= PointThinning.MaxPoints);
    }
}
