using FitSpec.Reporting;
using FitSpec.Results;
using FitSpec.Spec;

namespace FitSpec.Pipeline;

/// <summary>Stage 7's file side: writes a result's formats into the out folder, each file atomically.</summary>
public static class OutputWriter
{
    public static IReadOnlyList<string> Write(FitResult result, string outDir, IReadOnlyList<ReportFormat> formats, string? templateFolder)
    {
        ArgumentNullException.ThrowIfNull(result);
        ArgumentNullException.ThrowIfNull(formats);
        Directory.CreateDirectory(outDir);
        // Render everything first, so that a rendering failure leaves every earlier file untouched.
        var rendered = new List<(string Path, string Text)>();
        foreach (var format in formats)
        {
            var path = Path.Combine(outDir, result.Name + format switch
            {
                ReportFormat.Json => ".result.json",
                ReportFormat.Md => ".md",
                _ => ".html",
            });
            var text = format == ReportFormat.Json ? ResultJson.Write(result) : ReportRenderer.Render(result, format, templateFolder);
            rendered.Add((path, text));
        }

        foreach (var (path, text) in rendered)
        {
            AtomicFile.Write(path, text);
        }

        return rendered.Select(r => r.Path).ToList();
    }
}
