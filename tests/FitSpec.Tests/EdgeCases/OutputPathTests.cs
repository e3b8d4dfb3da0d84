using FitSpec.Tests.Cli;
using static FitSpec.Tests.EdgeCases.EdgeSpecs;

namespace FitSpec.Tests.EdgeCases;

/// <summary>An output place that cannot be a folder (a file stands in the way): exit 2 and one line naming it, no trace.</summary>
public sealed class OutputPathTests
{
    [Fact]
    public void Solve_into_a_folder_below_a_file_exits_2_naming_the_out_folder()
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", Csv(Header, Rows));
        var spec = cli.Write("fit.fit.yaml", FitYaml("fit", Line));

        var run = cli.Run("solve", spec, "--out", "d.csv/out", "--format", "json");

        Assert.True(run.ExitCode == 2, run.ToString());
        Assert.Contains(run.StderrLines, l => l.StartsWith("d.csv/out: error: cannot write", StringComparison.Ordinal));
        Assert.Equal("x,y", cli.Read("d.csv").Split('\n')[0]);
    }

    [Fact]
    public void Lower_into_a_folder_below_a_file_exits_2_with_one_line_naming_the_target()
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", Csv(Header, Rows));
        var spec = cli.Write("fit.fit.yaml", FitYaml("fit", Line, tail: PositiveSlope));

        var run = cli.Run("lower", spec, "--mps", "d.csv/fit.mps");

        Assert.True(run.ExitCode == 2, run.ToString());
        var line = Assert.Single(run.StderrLines);
        Assert.Contains("d.csv/fit.mps", line, StringComparison.Ordinal);
        Assert.Contains("error", line, StringComparison.Ordinal);
    }
}
