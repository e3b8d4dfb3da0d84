using System.Text.Json;
using static FitSpec.Tests.Cli.CliSpecs;

namespace FitSpec.Tests.Cli;

/// <summary>Exit codes, written files and help of `fitspec`, run as a process.</summary>
public sealed class CliOutcomeTests
{
    [Fact]
    public void Two_specs_with_one_name_refuse_the_second_and_exit_2()
    {
        using var cli = new CliHarness();
        cli.Write("a/d.csv", SampleData);
        cli.Write("b/d.csv", SampleData);
        cli.Write("a/same.fit.yaml", Linear("same"));
        var second = cli.Write("b/same.fit.yaml", Linear("same"));
        var run = cli.Run("solve", cli.Folder, "--out", "out");
        Assert.True(run.ExitCode == 2, run.ToString());
        Assert.Contains("fit name 'same' is also the name of", run.Stderr, StringComparison.Ordinal);
        Assert.Contains(Path.GetFileName(Path.GetDirectoryName(second)!), run.Stderr, StringComparison.Ordinal);
        Assert.Equal("optimal", cli.Json("out/same.result.json").GetProperty("status").GetString());
    }

    [Fact]
    public void Contradictory_constraints_exit_3_with_status_infeasible()
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", SampleData);
        var spec = cli.Write("contra.fit.yaml", Linear("contra", tail: "constraints:\n  - \"b1 >= 1\"\n  - \"b1 <= 0\"\n"));
        var run = cli.Run("solve", spec, "--out", "out");
        Assert.True(run.ExitCode == 3, run.ToString());
        var result = cli.Json("out/contra.result.json");
        Assert.Equal("infeasible", result.GetProperty("status").GetString());
        Assert.Contains("infeasible", run.Stderr, StringComparison.Ordinal);
    }

    [Fact]
    public void Failing_acceptance_rule_exits_1_and_a_passing_one_exits_0()
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", SampleData);
        var failing = cli.Write("strict.fit.yaml", Linear("strict", tail: "report:\n  accept:\n    - \"max_abs_residual <= 0.001\"\n"));
        var passing = cli.Write("loose.fit.yaml", Linear("loose", tail: "report:\n  accept:\n    - \"max_abs_residual <= 1\"\n"));

        var fail = cli.Run("solve", failing, "--out", "out");
        Assert.True(fail.ExitCode == 1, fail.ToString());
        var strict = cli.Json("out/strict.result.json");
        Assert.Equal("optimal", strict.GetProperty("status").GetString());
        var rule = Assert.Single(strict.GetProperty("acceptance").EnumerateArray());
        Assert.Equal(JsonValueKind.False, rule.GetProperty("passed").ValueKind);

        var pass = cli.Run("solve", passing, "--out", "out");
        Assert.True(pass.ExitCode == 0, pass.ToString());
        Assert.Equal(JsonValueKind.True, Assert.Single(cli.Json("out/loose.result.json").GetProperty("acceptance").EnumerateArray()).GetProperty("passed").ValueKind);
    }

    [Fact]
    public void Demo_specs_folder_solves_with_exit_0_and_writes_every_report()
    {
        var specs = Path.Combine(CliHarness.RepositoryRoot(), "specs");
        var count = Directory.GetFiles(specs, "*.fit.yaml").Length;
        Assert.True(count >= 3, $"{count} demo specs");
        using var cli = new CliHarness();
        var run = cli.Run("solve", specs, "--out", "out");
        Assert.True(run.ExitCode == 0, run.ToString());
        var outDir = Path.Combine(cli.Folder, "out");
        var results = Directory.GetFiles(outDir, "*.result.json");
        Assert.Equal(count, results.Length);
        // Besides each fit's reports, the run's own index pages (index.md, index.html).
        Assert.Equal(count + 1, Directory.GetFiles(outDir, "*.md").Length);
        Assert.Equal(count + 1, Directory.GetFiles(outDir, "*.html").Length);
        Assert.True(File.Exists(Path.Combine(outDir, "index.md")) && File.Exists(Path.Combine(outDir, "index.html")), "index pages missing");
        foreach (var file in results)
        {
            var result = JsonDocument.Parse(File.ReadAllText(file)).RootElement;
            var name = result.GetProperty("name").GetString()!;
            Assert.Equal(Path.GetFileName(file), name + ".result.json");
            Assert.Equal("optimal", result.GetProperty("status").GetString());
            Assert.True(File.Exists(Path.Combine(outDir, name + ".md")) && File.Exists(Path.Combine(outDir, name + ".html")), name);
            Assert.All(result.GetProperty("acceptance").EnumerateArray(), a => Assert.Equal(JsonValueKind.True, a.GetProperty("passed").ValueKind));
        }
    }

    /// <summary>
    /// An invalid spec still gets `name.result.json` (status error, errors with file/line/column/field/message), and its
    /// Markdown and HTML reports list the errors, replacing the good reports an earlier run wrote under the same name.
    /// </summary>
    [Fact]
    public void Invalid_spec_replaces_an_earlier_good_report_with_an_error_report()
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", SampleData);
        var good = Linear("calib");
        var spec = cli.Write("calib.fit.yaml", good);
        var first = cli.Run("solve", spec, "--out", "out");
        Assert.True(first.ExitCode == 0, first.ToString());
        Assert.Equal("optimal", cli.Json("out/calib.result.json").GetProperty("status").GetString());
        Assert.Contains("Coefficients", cli.Read("out/calib.md"), StringComparison.Ordinal);
        Assert.Contains("Coefficients", cli.Read("out/calib.html"), StringComparison.Ordinal);

        var bad = good + "constraint:\n  - \"b1 >= 0\"\n";
        cli.Write("calib.fit.yaml", bad);
        var (line, column) = Locate(bad, "constraint:");
        var second = cli.Run("solve", spec, "--out", "out");
        Assert.True(second.ExitCode == 2, second.ToString());

        var result = cli.Json("out/calib.result.json");
        Assert.Equal("error", result.GetProperty("status").GetString());
        Assert.Equal(JsonValueKind.Null, result.GetProperty("objective").ValueKind);
        var error = Assert.Single(result.GetProperty("errors").EnumerateArray());
        Assert.Equal(spec, error.GetProperty("file").GetString());
        Assert.Equal(line, error.GetProperty("line").GetInt32());
        Assert.Equal(column, error.GetProperty("column").GetInt32());
        Assert.Equal("constraint", error.GetProperty("field").GetString());
        var message = error.GetProperty("message").GetString()!;
        Assert.Contains("unknown key 'constraint'", message, StringComparison.Ordinal);

        var md = cli.Read("out/calib.md");
        Assert.Contains("unknown key 'constraint'", md, StringComparison.Ordinal);
        Assert.DoesNotContain("Coefficients", md, StringComparison.Ordinal);
        var html = cli.Read("out/calib.html");
        Assert.Contains("unknown key", html, StringComparison.Ordinal);
        Assert.DoesNotContain("Coefficients", html, StringComparison.Ordinal);
    }

    /// <summary>YAML that cannot be parsed still gets an error result, named after the file.</summary>
    [Fact]
    public void Unparseable_spec_gets_an_error_result_named_after_the_file()
    {
        using var cli = new CliHarness();
        var spec = cli.Write("broken.fit.yaml", "fitspec: 1\nname: foo: bar\n");
        var run = cli.Run("solve", spec, "--out", "out");
        Assert.True(run.ExitCode == 2, run.ToString());
        var result = cli.Json("out/broken.result.json");
        Assert.Equal("error", result.GetProperty("status").GetString());
        var error = Assert.Single(result.GetProperty("errors").EnumerateArray());
        Assert.Equal(spec, error.GetProperty("file").GetString());
        Assert.Equal(2, error.GetProperty("line").GetInt32());
        Assert.Equal(JsonValueKind.Number, error.GetProperty("column").ValueKind);
        Assert.True(cli.Exists("out/broken.md") && cli.Exists("out/broken.html"), "error reports missing");
    }

    [Theory]
    [InlineData("")]
    [InlineData("solve")]
    [InlineData("check")]
    [InlineData("lower")]
    public void Help_exits_0_and_prints_usage(string command)
    {
        using var cli = new CliHarness();
        var run = command.Length == 0 ? cli.Run("--help") : cli.Run(command, "--help");
        Assert.True(run.ExitCode == 0, run.ToString());
        Assert.Contains("Usage:", run.Stdout, StringComparison.Ordinal);
        Assert.Contains(("fitspec " + command).Trim(), run.Stdout, StringComparison.Ordinal);
        Assert.Equal("", run.Stderr);
    }

    [Theory]
    [InlineData("solve", "x.fit.yaml")]
    [InlineData("lower", "x.fit.yaml")]
    [InlineData("frobnicate")]
    [InlineData("solve", "x.fit.yaml", "--out", "out", "--format", "pdf")]
    public void Usage_errors_exit_2_with_a_message(params string[] args)
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", SampleData);
        cli.Write("x.fit.yaml", Linear("x"));
        var run = cli.Run(args);
        Assert.True(run.ExitCode == 2, run.ToString());
        Assert.Contains("error", run.Stderr, StringComparison.Ordinal);
        Assert.False(cli.Exists("out/x.result.json"), "nothing should be solved on a usage error");
    }

    [Fact]
    public void Missing_spec_file_exits_2_naming_it()
    {
        using var cli = new CliHarness();
        var run = cli.Run("solve", "nowhere.fit.yaml", "--out", "out");
        Assert.True(run.ExitCode == 2, run.ToString());
        Assert.Contains("nowhere.fit.yaml", run.Stderr, StringComparison.Ordinal);
    }
}
