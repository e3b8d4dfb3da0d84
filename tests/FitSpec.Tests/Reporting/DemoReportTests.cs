using System.Text.RegularExpressions;
using System.Xml.Linq;
using FitSpec.Pipeline;
using FitSpec.Reporting;
using FitSpec.Spec;
using FitSpec.Tests.Cli;
using FitSpec.Tests.Support;

namespace FitSpec.Tests.Reporting;

/// <summary>The demo specs solved and written: reports render, link only files that exist, and plot what they have.</summary>
public sealed class DemoReportTests
{
    public static TheoryData<string> Specs()
    {
        var data = new TheoryData<string>();
        foreach (var file in Directory.GetFiles(Path.Combine(CliHarness.RepositoryRoot(), "specs"), "*.fit.yaml").Order(StringComparer.Ordinal))
        {
            data.Add(Path.GetFileName(file));
        }

        return data;
    }

    [Theory]
    [MemberData(nameof(Specs))]
    public void Demo_spec_reports_are_complete_and_self_contained(string spec)
    {
        using var folder = new TempFolder();
        var outcome = FitRunner.RunForOutput(Path.Combine(CliHarness.RepositoryRoot(), "specs", spec));
        var result = outcome.Result;
        Assert.Empty(result.Errors);

        var written = OutputWriter.Write(result, folder.Path, [ReportFormat.Json, ReportFormat.Md, ReportFormat.Html], null);
        Assert.Equal(written.Order(StringComparer.Ordinal), Directory.GetFiles(folder.Path).Order(StringComparer.Ordinal));

        var html = File.ReadAllText(Path.Combine(folder.Path, result.Name + ".html"));
        Assert.Contains(ReportRenderer.Caution, html);
        Assert.Contains("id=\"acceptance\"", html);
        Assert.DoesNotContain("<script", html, StringComparison.OrdinalIgnoreCase);
        Assert.DoesNotMatch(new Regex(@"\b(src|href)\s*=", RegexOptions.IgnoreCase), html);

        var md = File.ReadAllText(Path.Combine(folder.Path, result.Name + ".md"));
        Assert.DoesNotContain("\n\n\n", md, StringComparison.Ordinal);
        Assert.EndsWith("\n", md, StringComparison.Ordinal);
        var links = Regex.Matches(md, @"!\[[^\]]*\]\(([^)]+)\)").Select(m => Uri.UnescapeDataString(m.Groups[1].Value)).ToList();
        var svgs = written.Where(p => p.EndsWith(".svg", StringComparison.Ordinal)).ToList();
        Assert.Equal(svgs.Select(Path.GetFileName), links);
        foreach (var svg in svgs)
        {
            Assert.Equal("svg", XDocument.Parse(File.ReadAllText(svg)).Root!.Name.LocalName);
        }

        // Plots follow the data the result carries: none without per-row series, at least three with.
        var inline = Regex.Matches(html, "<svg ").Count;
        if (result.Series is null)
        {
            Assert.Empty(svgs);
            Assert.Equal(0, inline);
        }
        else
        {
            Assert.InRange(svgs.Count, 3, 4);
            Assert.Equal(svgs.Count, inline);
        }
    }
}
