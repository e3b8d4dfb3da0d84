using FitSpec.Review;

namespace FitSpec.Tests.Review;

/// <summary>The text and Markdown layouts of the scenario's comparison.</summary>
public sealed class DiffReportTests(ReviewScenario scenario) : IClassFixture<ReviewScenario>
{
    private ResultDiff Diff() =>
        ResultComparer.Compare(ResultFolder.Read(scenario.Workspace.OldResults), ResultFolder.Read(scenario.Workspace.NewResults), NumberTolerance.Exact);

    [Fact]
    public void Markdown_has_a_summary_line_and_a_table_per_changed_fit()
    {
        var md = MarkdownDiffReport.Render(Diff(), all: false);
        var lines = md.Split('\n');
        Assert.Equal("**FitSpec diff: 2 changed, 1 added, 1 removed, 1 unchanged** (5 fits, numbers compared exactly)", lines[0]);
        Assert.Equal(["#### `bounded` — changed", "#### `gauge` — changed"], lines.Where(l => l.StartsWith("####", StringComparison.Ordinal)));
        Assert.Equal(2, lines.Count(l => l == "| item | old | new | change | relative |"));

        var b1 = Row(Table(lines, "bounded"), "coefficient `b1`");
        var old = scenario.Old["bounded"].Coefficients.Single(c => c.Name == "b1").Value;
        var now = scenario.New["bounded"].Coefficients.Single(c => c.Name == "b1").Value;
        Assert.Equal(DiffRows.Number(old), b1[1]);
        Assert.Equal(DiffRows.Number(now), b1[2]);
        Assert.Equal(DiffRows.Signed(now - old), b1[3]);
        Assert.Equal(DiffRows.Percent((now - old) / Math.Abs(old)), b1[4]);
        Assert.StartsWith("-", b1[3], StringComparison.Ordinal);
        Assert.Equal("spec edited", Row(Table(lines, "bounded"), "spec sha256")[3]);
        Assert.DoesNotContain(Table(lines, "bounded"), l => l.StartsWith("| data sha256", StringComparison.Ordinal));

        var rule = Row(Table(lines, "gauge"), $"rule `{ReviewScenario.GaugeRule}`");
        Assert.StartsWith("PASS (", rule[1], StringComparison.Ordinal);
        Assert.StartsWith("**FAIL (", rule[2], StringComparison.Ordinal);
        Assert.Equal("now fails", rule[3]);

        Assert.Contains("- `fresh`: optimal", md, StringComparison.Ordinal);
        Assert.Contains("- `retired` (was optimal", md, StringComparison.Ordinal);
        Assert.Contains("Unchanged (1): `steady`", lines);
        Assert.DoesNotContain("#### `steady`", md, StringComparison.Ordinal);
    }

    [Fact]
    public void All_details_unchanged_fits_and_items_too()
    {
        var md = MarkdownDiffReport.Render(Diff(), all: true);
        var lines = md.Split('\n');
        Assert.Contains("#### `steady` — unchanged", lines);
        Assert.DoesNotContain("Unchanged (1)", md, StringComparison.Ordinal);
        var steady = Table(lines, "steady");
        var b0 = scenario.Old["steady"].Coefficients[0];
        Assert.Equal(["coefficient `b0`", DiffRows.Number(b0.Value), DiffRows.Number(b0.Value), "", ""], Row(steady, "coefficient `b0`"));
        Assert.Contains(Table(lines, "bounded"), l => l.StartsWith("| data sha256", StringComparison.Ordinal));
    }

    [Fact]
    public void Text_lists_changed_fits_in_aligned_columns_and_unchanged_in_one_line()
    {
        var text = TextDiffReport.Render(Diff(), all: false);
        var lines = text.Split('\n');
        Assert.Equal("5 fits: 2 changed, 1 added, 1 removed, 1 unchanged", lines[2]);
        Assert.Equal(["changed: bounded", "changed: gauge"], lines.Where(l => l.StartsWith("changed: ", StringComparison.Ordinal)));
        Assert.Contains("unchanged (1): steady", lines);
        Assert.Single(lines, l => l.StartsWith("added: fresh (optimal, objective ", StringComparison.Ordinal));
        Assert.Single(lines, l => l.StartsWith("removed: retired (was optimal", StringComparison.Ordinal));
        var ruleLine = Assert.Single(lines, l => l.Contains($"rule \"{ReviewScenario.GaugeRule}\"", StringComparison.Ordinal));
        Assert.EndsWith("now fails", ruleLine, StringComparison.Ordinal);

        // Columns line up: in the bounded block every row's "old" column starts where the header's does.
        var start = Array.IndexOf(lines, "changed: bounded") + 1;
        var block = lines.Skip(start).TakeWhile(l => l.StartsWith("  ", StringComparison.Ordinal)).ToList();
        var oldColumn = block[0].IndexOf("old", StringComparison.Ordinal);
        Assert.All(block.Skip(1), l => Assert.True(l[oldColumn - 1] == ' ' && l[oldColumn] != ' ', l));
    }

    [Fact]
    public void No_differences_reads_as_such()
    {
        var set = ResultFolder.Read(scenario.Workspace.OldResults);
        var diff = ResultComparer.Compare(set, set, new NumberTolerance(1e-9));
        Assert.StartsWith("**FitSpec diff: no differences** (4 fits, numbers within 1E-09 × max(1, |old|)", MarkdownDiffReport.Render(diff, all: false), StringComparison.Ordinal);
        Assert.Equal("no differences in 4 fits", TextDiffReport.Render(diff, all: false).Split('\n')[2]);
    }

    [Fact]
    public void Markdown_cells_escape_pipes_and_backticks()
    {
        var old = ComparisonRuleTests.Summary("odd`name", [], [new("abs(b1) <= 1 | b0 > 0", 0.5, true)]);
        var now = ComparisonRuleTests.Summary("odd`name", [], [new("abs(b1) <= 1 | b0 > 0", 2, false)]);
        var md = MarkdownDiffReport.Render(ResultComparer.Compare(old, now, NumberTolerance.Exact), all: false);
        Assert.Contains("#### ``odd`name`` — changed", md, StringComparison.Ordinal);
        Assert.Contains("| rule `abs(b1) <= 1 \\| b0 > 0` | PASS (0.5) | **FAIL (2)** | now fails |  |", md, StringComparison.Ordinal);
    }

    /// <summary>The table rows after a fit's heading.</summary>
    private static List<string> Table(string[] lines, string fit)
    {
        var heading = Array.FindIndex(lines, l => l.StartsWith($"#### `{fit}`", StringComparison.Ordinal));
        Assert.True(heading >= 0, fit);
        return lines.Skip(heading + 2).TakeWhile(l => l.StartsWith('|')).ToList();
    }

    /// <summary>The cells of the row whose first cell is <paramref name="what"/> (split on unescaped pipes).</summary>
    private static string[] Row(List<string> table, string what)
    {
        var rows = table.Select(l => System.Text.RegularExpressions.Regex.Split(l.Trim('|'), @"(?<!\\)\|").Select(c => c.Trim()).ToArray()).ToList();
        return Assert.Single(rows, r => r[0] == what);
    }
}
