using FitSpec.Tests.Cli;
using static FitSpec.Tests.Cli.CliSpecs;

namespace FitSpec.Tests.Hostile;

/// <summary>
/// A spec may only name files in its own folder or below it (data, database, templates), unless the run is
/// given --allow-outside-paths: otherwise a spec from elsewhere could make a run read, hash and report any
/// file the user can read. The refusal is a located spec error, before anything named is opened.
/// </summary>
public sealed class PathConfinementTests
{
    [Theory]
    [InlineData("../d.csv")]
    [InlineData("sub/../../d.csv")]
    [InlineData("ABSOLUTE")]
    [InlineData("link.csv")]
    [InlineData("linkdir/d.csv")]
    public void A_data_path_leading_outside_the_spec_folder_is_refused_at_its_position(string dataPath)
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", SampleData);
        Directory.CreateDirectory(Path.Combine(cli.Folder, "specs", "sub"));
        File.CreateSymbolicLink(Path.Combine(cli.Folder, "specs", "link.csv"), Path.Combine(cli.Folder, "d.csv"));
        Directory.CreateSymbolicLink(Path.Combine(cli.Folder, "specs", "linkdir"), cli.Folder);
        var path = dataPath == "ABSOLUTE" ? Path.Combine(cli.Folder, "d.csv") : dataPath;
        var yaml = Linear("outside", path);
        cli.Write("specs/outside.fit.yaml", yaml);

        var run = cli.Run("solve", "specs/outside.fit.yaml", "--out", "out");
        Assert.True(run.ExitCode == 2, run.ToString());
        var error = SingleError(run, SpecError());
        var (line, column) = Locate(yaml, path);
        Assert.Equal($"specs/outside.fit.yaml:{line}:{column}", $"{error.Groups["file"].Value}:{error.Groups["line"].Value}:{error.Groups["col"].Value}");
        Assert.Contains("leads outside the spec's folder", error.Groups["msg"].Value, StringComparison.Ordinal);
        Assert.Contains("--allow-outside-paths", error.Groups["msg"].Value, StringComparison.Ordinal);
        var result = cli.Json("out/outside.result.json");
        Assert.Equal("error", result.GetProperty("status").GetString());
        // Nothing named was opened: the result has no data block and no data digest.
        Assert.False(result.TryGetProperty("data", out _));

        var allowed = cli.Run("solve", "specs/outside.fit.yaml", "--out", "out", "--allow-outside-paths");
        Assert.True(allowed.ExitCode == 0, allowed.ToString());
        Assert.Equal("optimal", cli.Json("out/outside.result.json").GetProperty("status").GetString());
    }

    [Fact]
    public void Paths_below_the_spec_folder_and_links_that_stay_inside_are_accepted()
    {
        using var cli = new CliHarness();
        cli.Write("specs/data/d.csv", SampleData);
        File.CreateSymbolicLink(Path.Combine(cli.Folder, "specs", "inside.csv"), Path.Combine(cli.Folder, "specs", "data", "d.csv"));
        cli.Write("specs/a.fit.yaml", Linear("a", "data/d.csv"));
        cli.Write("specs/b.fit.yaml", Linear("b", "data/../data/d.csv"));
        cli.Write("specs/c.fit.yaml", Linear("c", "inside.csv"));
        var run = cli.Run("solve", "specs", "--out", "out");
        Assert.True(run.ExitCode == 0, run.ToString());
    }

    [Fact]
    public void Templates_and_databases_outside_are_refused_and_check_and_lower_apply_the_same_rule()
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", SampleData);
        cli.Write("specs/d.csv", SampleData);
        cli.Write("templates/report.md.sbn", "# {{ result.name }}\n");
        var templates = Linear("tpl", "d.csv", tail: "report:\n  templates: ../templates\n");
        cli.Write("specs/tpl.fit.yaml", templates);
        cli.Write("specs/db.fit.yaml", "fitspec: 1\nname: db\ndata:\n  sqlite: ../lab.db\n  query: SELECT x, y FROM t\nmodel:\n  response: y\n  terms: {b0: 1, b1: x}\nloss: l2\n");

        var run = cli.Run("solve", "specs", "--out", "out");
        Assert.True(run.ExitCode == 2, run.ToString());
        Assert.Contains(run.StderrLines, l => l.StartsWith("specs/tpl.fit.yaml:", StringComparison.Ordinal) && l.Contains("'../templates' leads outside", StringComparison.Ordinal));
        Assert.Contains(run.StderrLines, l => l.StartsWith("specs/db.fit.yaml:", StringComparison.Ordinal) && l.Contains("'../lab.db' leads outside", StringComparison.Ordinal));

        cli.Write("specs/out.fit.yaml", Linear("out", "../d.csv"));
        var check = cli.Run("check", "specs/out.fit.yaml");
        Assert.True(check.ExitCode == 2 && check.Stderr.Contains("leads outside", StringComparison.Ordinal), check.ToString());
        var lower = cli.Run("lower", "specs/out.fit.yaml", "--mps", "out.mps");
        Assert.True(lower.ExitCode == 2 && lower.Stderr.Contains("leads outside", StringComparison.Ordinal), lower.ToString());
        Assert.False(cli.Exists("out.mps"));
        Assert.Equal(0, cli.Run("check", "specs/out.fit.yaml", "--allow-outside-paths").ExitCode);
    }
}
