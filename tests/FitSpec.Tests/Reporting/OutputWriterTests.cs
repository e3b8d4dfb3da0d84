using FitSpec.Pipeline;
using FitSpec.Reporting;
using FitSpec.Results;
using FitSpec.Spec;
using FitSpec.Tests.Support;

namespace FitSpec.Tests.Reporting;

/// <summary>The files a result turns into: reports, and for Markdown the plot files beside it.</summary>
public sealed class OutputWriterTests
{
    private static readonly ReportFormat[] All = [ReportFormat.Json, ReportFormat.Md, ReportFormat.Html];

    private static FitResult LeastSquares() =>
        SampleSeries.Full(SampleResults.Optimal() with { Statement = SampleResults.Optimal().Statement! with { Loss = "l2" } });

    [Fact]
    public void Returns_every_path_written_with_the_plots_beside_the_markdown()
    {
        using var folder = new TempFolder();
        var written = OutputWriter.Write(LeastSquares(), folder.Path, All, null);

        string[] names =
        [
            "thermistor.result.json", "thermistor.md", "thermistor.html",
            "thermistor.fit.svg", "thermistor.residuals.svg", "thermistor.histogram.svg", "thermistor.qq.svg",
        ];
        Assert.Equal(names.Select(n => Path.Combine(folder.Path, n)), written);
        Assert.All(written, p => Assert.True(File.Exists(p), p));
        Assert.Equal(written.Count, Directory.GetFiles(folder.Path).Length);

        var md = File.ReadAllText(Path.Combine(folder.Path, "thermistor.md"));
        foreach (var key in new[] { "fit", "residuals", "histogram", "qq" })
        {
            Assert.Contains($"](thermistor.{key}.svg)", md, StringComparison.Ordinal);
            var svg = File.ReadAllText(Path.Combine(folder.Path, $"thermistor.{key}.svg"));
            Assert.StartsWith("<svg xmlns=\"http://www.w3.org/2000/svg\"", svg, StringComparison.Ordinal);
        }

        // The HTML carries the same drawings inline and links no file.
        var html = File.ReadAllText(Path.Combine(folder.Path, "thermistor.html"));
        Assert.Equal(4, html.Split("<svg ").Length - 1);
        Assert.DoesNotContain(".svg", html, StringComparison.Ordinal);
    }

    [Fact]
    public void Without_markdown_no_plot_file_is_written()
    {
        using var folder = new TempFolder();
        var written = OutputWriter.Write(LeastSquares(), folder.Path, [ReportFormat.Html, ReportFormat.Json], null);

        Assert.Equal(2, written.Count);
        Assert.Empty(Directory.GetFiles(folder.Path, "*.svg"));
        Assert.Contains("<svg ", File.ReadAllText(Path.Combine(folder.Path, "thermistor.html")), StringComparison.Ordinal);
    }

    [Fact]
    public void A_result_without_series_writes_no_plot_files()
    {
        using var folder = new TempFolder();
        var written = OutputWriter.Write(SampleResults.Optimal(), folder.Path, All, null);

        Assert.Equal(3, written.Count);
        Assert.Empty(Directory.GetFiles(folder.Path, "*.svg"));
        Assert.DoesNotContain(".svg", File.ReadAllText(Path.Combine(folder.Path, "thermistor.md")), StringComparison.Ordinal);
    }

    [Fact]
    public void A_rendering_failure_leaves_every_earlier_file_as_it_was()
    {
        using var folder = new TempFolder();
        var earlier = new[] { "thermistor.result.json", "thermistor.md", "thermistor.html", "thermistor.fit.svg" };
        foreach (var name in earlier)
        {
            folder.Write(name, "earlier " + name);
        }

        var templates = Path.Combine(folder.Path, "templates");
        Directory.CreateDirectory(templates);
        File.WriteAllText(Path.Combine(templates, "report.html.sbn"), "{{ no_such_variable }}");

        Assert.Throws<ReportTemplateException>(() => OutputWriter.Write(LeastSquares(), folder.Path, All, templates));

        foreach (var name in earlier)
        {
            Assert.Equal("earlier " + name, File.ReadAllText(Path.Combine(folder.Path, name)));
        }

        Assert.Equal(earlier.Length, Directory.GetFiles(folder.Path).Length);
    }

    [Fact]
    public void Plots_a_new_result_no_longer_has_are_removed_beside_its_markdown()
    {
        using var folder = new TempFolder();
        OutputWriter.Write(LeastSquares(), folder.Path, All, null);
        Assert.True(File.Exists(Path.Combine(folder.Path, "thermistor.qq.svg")));
        folder.Write("other.qq.svg", "another fit's plot");

        // The same fit with a robust loss: no Q–Q plot any more.
        var written = OutputWriter.Write(SampleSeries.Full(), folder.Path, All, null);
        Assert.DoesNotContain(written, p => p.EndsWith(".qq.svg", StringComparison.Ordinal));
        Assert.False(File.Exists(Path.Combine(folder.Path, "thermistor.qq.svg")));
        Assert.True(File.Exists(Path.Combine(folder.Path, "thermistor.fit.svg")));
        Assert.True(File.Exists(Path.Combine(folder.Path, "other.qq.svg")));

        // An error result keeps no stale plot beside its error report.
        OutputWriter.Write(SampleResults.Invalid() with { Name = "thermistor" }, folder.Path, All, null);
        Assert.Empty(Directory.GetFiles(folder.Path, "thermistor.*.svg"));
    }
}
