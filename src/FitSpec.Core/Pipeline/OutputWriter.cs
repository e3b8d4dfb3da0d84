using FitSpec.Pipeline.Batch;
using FitSpec.Reporting;
using FitSpec.Reporting.Plots;
using FitSpec.Results;
using FitSpec.Spec;

namespace FitSpec.Pipeline;

/// <summary>
/// Stage 7's file side: writes a result's formats into the out folder, all of a fit's files atomically as one
/// (all written or none). A Markdown report gets its plots as &lt;name&gt;.&lt;plot&gt;.svg files beside it; HTML carries them inline.
/// </summary>
public static class OutputWriter
{
    /// <summary>Writes every file and returns the path of each one written (reports and plot files).</summary>
    public static IReadOnlyList<string> Write(FitResult result, string outDir, IReadOnlyList<ReportFormat> formats, string? templateFolder)
    {
        ArgumentNullException.ThrowIfNull(result);
        ArgumentNullException.ThrowIfNull(formats);
        CreateFolder(outDir);
        var wanted = formats.Distinct().ToList();
        var withMarkdown = wanted.Contains(ReportFormat.Md);

        // Render everything first, so that a rendering failure leaves every earlier file untouched.
        var plots = withMarkdown || wanted.Contains(ReportFormat.Html) ? ReportPlots.Build(result) : [];
        var rendered = new List<(string Path, string Text)>();
        foreach (var format in wanted)
        {
            var path = Path.Combine(outDir, result.Name + format switch
            {
                ReportFormat.Json => ".result.json",
                ReportFormat.Md => ".md",
                _ => ".html",
            });
            var text = format == ReportFormat.Json ? ResultJson.Write(result) : ReportRenderer.Render(result, format, templateFolder, plots);
            rendered.Add((path, text));
        }

        if (withMarkdown)
        {
            rendered.AddRange(plots.Select(p => (Path.Combine(outDir, ReportPlot.FileName(result.Name, p.Key)), p.FileSvg)));
        }

        // All or none: a fit that runs out of room part way must not leave a report linking plots that are not there.
        AtomicFile.WriteAll(rendered);

        if (withMarkdown)
        {
            RemoveStalePlots(result.Name, outDir, plots);
        }

        return rendered.Select(r => r.Path).ToList();
    }

    private static void CreateFolder(string outDir)
    {
        try
        {
            Directory.CreateDirectory(outDir);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw WriteFailure.For(outDir, e);
        }
    }

    // A plot an earlier run drew that this result no longer has (say, the Q–Q plot after a switch from l2)
    // would sit beside the new report unlinked and out of date.
    private static void RemoveStalePlots(string name, string outDir, IReadOnlyList<ReportPlot> plots)
    {
        foreach (var key in ReportPlots.Keys.Except(plots.Select(p => p.Key)))
        {
            File.Delete(Path.Combine(outDir, ReportPlot.FileName(name, key)));
        }
    }
}
