using System.Text.RegularExpressions;
using FitSpec.Tests.Cli;
using static FitSpec.Tests.Cli.CliSpecs;

namespace FitSpec.Tests.Review;

/// <summary>`fitspec diff` run as a process: exit codes, output on stdout, one-line errors on stderr.</summary>
public sealed class DiffCliTests
{
    [Fact]
    public void Two_solves_of_the_same_specs_have_no_differences_and_exit_0()
    {
        using var cli = new CliHarness();
        cli.Write("specs/d.csv", SampleData);
        cli.Write("specs/line.fit.yaml", Linear("line", tail: "report:\n  accept:\n    - \"rmse <= 1\"\n"));
        cli.Write("specs/capped.fit.yaml", Linear("capped", tail: "constraints:\n  - \"b1 <= 1.9\"\n"));
        Assert.Equal(0, cli.Run("solve", "specs", "--out", "a", "--format", "json").ExitCode);
        Assert.Equal(0, cli.Run("solve", "specs", "--out", "b", "--format", "json").ExitCode);

        var run = cli.Run("diff", "a", "b");
        Assert.True(run.ExitCode == 0, run.ToString());
        Assert.Contains("no differences in 2 fits", run.Stdout, StringComparison.Ordinal);
        Assert.Equal("", run.Stderr);

        var single = cli.Run("diff", "a/line.result.json", "b/line.result.json", "--markdown");
        Assert.True(single.ExitCode == 0, single.ToString());
        Assert.StartsWith("**FitSpec diff: no differences** (1 fit,", single.Stdout, StringComparison.Ordinal);
    }

    [Fact]
    public void A_changed_constraint_exits_1_with_a_markdown_table_naming_the_coefficient()
    {
        using var cli = new CliHarness();
        cli.Write("old/d.csv", SampleData);
        cli.Write("new/d.csv", SampleData);
        cli.Write("old/capped.fit.yaml", Linear("capped", tail: "constraints:\n  - \"b1 <= 1.9\"\n"));
        cli.Write("new/capped.fit.yaml", Linear("capped", tail: "constraints:\n  - \"b1 <= 1.8\"\n"));
        Assert.Equal(0, cli.Run("solve", "old", "--out", "a", "--format", "json").ExitCode);
        Assert.Equal(0, cli.Run("solve", "new", "--out", "b", "--format", "json").ExitCode);
        var old = cli.Json("a/capped.result.json").GetProperty("coefficients").GetProperty("b1").GetRawText();
        var now = cli.Json("b/capped.result.json").GetProperty("coefficients").GetProperty("b1").GetRawText();

        var run = cli.Run("diff", "a", "b", "--markdown");
        Assert.True(run.ExitCode == 1, run.ToString());
        Assert.StartsWith("**FitSpec diff: 1 changed, 0 added, 0 removed, 0 unchanged**", run.Stdout, StringComparison.Ordinal);
        Assert.Contains("#### `capped` — changed", run.Stdout, StringComparison.Ordinal);
        Assert.Contains($"| coefficient `b1` | {old} | {now} | -", run.Stdout, StringComparison.Ordinal);

        // A tolerance wider than the move leaves only the edited spec as the difference.
        var loose = cli.Run("diff", "a", "b", "--tolerance", "0.5");
        Assert.True(loose.ExitCode == 1, loose.ToString());
        Assert.DoesNotContain("coefficient b1", loose.Stdout, StringComparison.Ordinal);
        Assert.Contains("spec edited", loose.Stdout, StringComparison.Ordinal);
    }

    [Fact]
    public void Bad_input_exits_2_with_one_line_messages()
    {
        using var cli = new CliHarness();
        cli.Write("a/x.result.json", "{\n  \"fitspec\": 1,\n  \"name\": \"x\",\n  \"status\": optimal\n}\n");
        cli.Write("b/x.result.json", "{\"fitspec\": 1, \"name\": \"x\", \"status\": \"optimal\"}\n");

        var mixed = cli.Run("diff", "a/x.result.json", "b");
        Assert.True(mixed.ExitCode == 2, mixed.ToString());
        Assert.Contains("cannot compare a file (a/x.result.json) with a folder (b)", mixed.Stderr, StringComparison.Ordinal);

        var missing = cli.Run("diff", "a", "nowhere");
        Assert.True(missing.ExitCode == 2, missing.ToString());
        Assert.Equal("nowhere: error: no such result file or folder", Assert.Single(missing.StderrLines));

        var malformed = cli.Run("diff", "a", "b");
        Assert.True(malformed.ExitCode == 2, malformed.ToString());
        var line = Assert.Single(malformed.StderrLines);
        var m = Regex.Match(line, @"^(?<file>.+):(?<line>\d+):(?<col>\d+): error: not valid JSON: ");
        Assert.True(m.Success, line);
        Assert.EndsWith("x.result.json", m.Groups["file"].Value, StringComparison.Ordinal);
        Assert.Equal(("4", "13"), (m.Groups["line"].Value, m.Groups["col"].Value));
        Assert.Equal("", malformed.Stdout);

        Directory.CreateDirectory(Path.Combine(cli.Folder, "specs"));
        var empty = cli.Run("diff", "specs", "b");
        Assert.True(empty.ExitCode == 2, empty.ToString());
        Assert.Equal("specs: error: no *.result.json files in this folder; give the --out folder of 'fitspec solve'", Assert.Single(empty.StderrLines));

        var negative = cli.Run("diff", "b", "b", "--tolerance", "-1");
        Assert.True(negative.ExitCode == 2, negative.ToString());
        Assert.Contains("--tolerance must be a number ≥ 0", negative.Stderr, StringComparison.Ordinal);
    }
}
