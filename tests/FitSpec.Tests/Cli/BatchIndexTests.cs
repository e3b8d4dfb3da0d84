using System.Text.RegularExpressions;
using FitSpec.Reporting;
using static FitSpec.Tests.Cli.BatchSpecs;

namespace FitSpec.Tests.Cli;

/// <summary>OUT/index.html and OUT/index.md: every fit of the run, its status and acceptance, links that resolve.</summary>
public sealed partial class BatchIndexTests
{
    [Fact]
    public void Index_pages_list_every_fit_with_its_outcome_and_links_that_exist()
    {
        using var cli = new CliHarness();
        var names = WriteBatch(cli, 4).ToList();
        cli.Write("specs/broken.fit.yaml", Unparseable);
        cli.Write("specs/strict.csv", DataCsv(5));
        cli.Write("specs/strict.fit.yaml", SpecYaml(5, FailingAcceptance + "title: \"Cell <b>7</b> & 'co'\"\n").Replace(Name(5), "strict", StringComparison.Ordinal));
        var run = cli.Run("solve", "specs", "--out", "out");
        Assert.True(run.ExitCode == 2, run.ToString());
        var fits = names.Append("broken").Append("strict").ToList();

        var html = cli.Read("out/index.html");
        var rows = TableRow().Matches(html).Select(m => m.Value).ToList();
        Assert.Equal(fits.Count, rows.Count);
        foreach (var (fit, row) in fits.Order(StringComparer.Ordinal).Zip(rows))
        {
            Assert.Contains($">{fit}<", row, StringComparison.Ordinal);
            Assert.Contains($"href=\"{fit}.html\"", row, StringComparison.Ordinal);
            Assert.Contains($"href=\"{fit}.result.json\"", row, StringComparison.Ordinal);
        }

        var strictRow = rows.Single(r => r.Contains(">strict<", StringComparison.Ordinal));
        Assert.Contains("<span class=\"fail\">FAIL 1/2</span>", strictRow, StringComparison.Ordinal);
        Assert.Contains("Cell &lt;b&gt;7&lt;/b&gt; &amp; &#39;co&#39;", strictRow, StringComparison.Ordinal);
        Assert.Contains("badge bad\">error", rows.Single(r => r.Contains(">broken<", StringComparison.Ordinal)), StringComparison.Ordinal);
        Assert.Contains("<td class=\"num\">8</td>", rows.Single(r => r.Contains(">fit00<", StringComparison.Ordinal)), StringComparison.Ordinal); // its observations
        Assert.Contains(ReportRenderer.Caution, html, StringComparison.Ordinal);
        Assert.DoesNotContain("<script", html, StringComparison.OrdinalIgnoreCase);
        Assert.DoesNotContain("<link", html, StringComparison.OrdinalIgnoreCase);
        AssertLinksExist(cli, HtmlLink().Matches(html).Select(m => m.Groups[1].Value).ToList(), 4 * fits.Count);

        var md = cli.Read("out/index.md");
        var mdRows = md.Split('\n').Where(l => l.StartsWith("| [", StringComparison.Ordinal)).ToList();
        Assert.Equal(fits.Order(StringComparer.Ordinal).Select(f => $"| [{f}]({f}.md)"), mdRows.Select(r => r[..r.IndexOf(')', StringComparison.Ordinal)] + ")"));
        Assert.Contains("**FAIL 1/2**", mdRows.Single(r => r.StartsWith("| [strict]", StringComparison.Ordinal)), StringComparison.Ordinal);
        Assert.Contains(ReportRenderer.Caution, md, StringComparison.Ordinal);
        AssertLinksExist(cli, MdLink().Matches(md).Select(m => m.Groups[1].Value).ToList(), 4 * fits.Count);
    }

    /// <summary>A second run over a subset rewrites the index with just the fits of that run.</summary>
    [Fact]
    public void The_index_lists_the_fits_of_the_latest_run()
    {
        using var cli = new CliHarness();
        WriteBatch(cli, 3);
        Assert.Equal(0, cli.Run("solve", "specs", "--out", "out").ExitCode);
        Assert.Equal(3, TableRow().Matches(cli.Read("out/index.html")).Count);
        Assert.Equal(0, cli.Run("solve", "specs/fit01.fit.yaml", "--out", "out").ExitCode);
        var rows = TableRow().Matches(cli.Read("out/index.html")).ToList();
        Assert.Contains(">fit01<", Assert.Single(rows).Value, StringComparison.Ordinal);
        Assert.Contains("fitspec solve specs/fit01.fit.yaml --out out", cli.Read("out/index.md"), StringComparison.Ordinal);
    }

    private static void AssertLinksExist(CliHarness cli, IReadOnlyList<string> links, int expected)
    {
        Assert.Equal(expected, links.Count);
        foreach (var link in links)
        {
            Assert.True(cli.Exists(Path.Combine("out", Uri.UnescapeDataString(link))), $"index links to {link}, which is not in the out folder");
        }
    }

    [GeneratedRegex("<tr>\\n<td>.*?</tr>", RegexOptions.Singleline)]
    private static partial Regex TableRow();

    [GeneratedRegex("href=\"([^\"]+)\"")]
    private static partial Regex HtmlLink();

    [GeneratedRegex(@"\]\(([^)\s]+)\)")]
    private static partial Regex MdLink();
}
